import { notFound } from "next/navigation";
import { IncidentScreen } from "@/components/incidents/IncidentScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Incidents" };

export default async function IncidentsPage({ params }: { params: Promise<{ env: string }> }) {
  const user = await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return <IncidentScreen env={env} canWrite={roleHas(user.role, "inventory:write")} />;
}
