import { notFound } from "next/navigation";
import { IncidentDetail } from "@/components/incidents/IncidentDetail";

export const metadata = { title: "Incident" };

export default async function IncidentPage({ params }: { params: Promise<{ env: string; number: string }> }) {
  const { env, number } = await params;
  if (!/^[1-9]\d{0,8}$/.test(number)) notFound();
  return <IncidentDetail env={env} number={Number(number)} />;
}
