import { Suspense } from "react";
import { IncidentScreen } from "@/components/incidents/IncidentScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

export const metadata = { title: "Incidents" };

export default async function IncidentsPage({ params }: { params: Promise<{ env: string }> }) {
  const [{ env }, user] = await Promise.all([params, requireUser()]);
  return (
    <Suspense>
      <IncidentScreen env={env} canWrite={roleHas(user.role, "inventory:write")} />
    </Suspense>
  );
}
