import { PoliciesScreen } from "@/components/policies/PoliciesScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

export async function generateMetadata({ params }: { params: Promise<{ env: string }> }) {
  return { title: `Change policies · ${(await params).env}` };
}

export default async function PoliciesPage({ params }: { params: Promise<{ env: string }> }) {
  const [{ env }, user] = await Promise.all([params, requireUser()]);
  // The API checks the role again on every save; this only decides whether to offer editing.
  return <PoliciesScreen env={env} canWrite={roleHas(user.role, "reviews:write")} />;
}
