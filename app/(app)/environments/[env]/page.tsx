import { notFound } from "next/navigation";
import { Overview } from "@/components/overview/Overview";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Overview" };

export default async function EnvironmentOverviewPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return <Overview env={env} />;
}
