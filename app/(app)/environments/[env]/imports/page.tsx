import { Suspense } from "react";
import { ImportsScreen } from "@/components/imports/ImportsScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

export const metadata = { title: "Imports" };

export default async function ImportsPage({ params }: { params: Promise<{ env: string }> }) {
  const [{ env }, user] = await Promise.all([params, requireUser()]);
  // The push API checks the role again; this only decides whether to offer the upload.
  return (
    <Suspense>
      <ImportsScreen env={env} canUpload={roleHas(user.role, "inventory:write")} role={user.role} />
    </Suspense>
  );
}
