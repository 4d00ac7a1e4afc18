import { notFound } from "next/navigation";
import { IncidentDetail } from "@/components/incidents/IncidentDetail";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Incident" };

export default async function IncidentPage({ params }: { params: Promise<{ env: string; number: string }> }) {
  await requireUser();
  const { env, number } = await params;
  if (!SLUG_PATTERN.test(env) || !/^[1-9]\d{0,8}$/.test(number)) notFound();
  return <IncidentDetail env={env} number={Number(number)} />;
}
