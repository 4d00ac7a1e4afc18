import { notFound } from "next/navigation";
import { ImportsScreen } from "@/components/imports/ImportsScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Imports" };

export default async function ImportsPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  const user = await requireUser();
  // The push API checks the role again; this only decides whether to offer the upload.
  return <ImportsScreen env={env} canUpload={roleHas(user.role, "inventory:write")} role={user.role} />;
}
