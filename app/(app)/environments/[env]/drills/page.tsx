import { Suspense } from "react";
import { Drills } from "@/components/drills/Drills";

export const metadata = { title: "Drills" };

export default async function DrillsPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  return (
    <Suspense>
      <Drills env={env} />
    </Suspense>
  );
}
