import { Overview } from "@/components/overview/Overview";

export const metadata = { title: "Overview" };

export default async function EnvironmentOverviewPage({ params }: { params: Promise<{ env: string }> }) {
  return <Overview env={(await params).env} />;
}
