import { Suspense } from "react";
import { DriftScreen } from "@/components/drift/DriftScreen";

export const metadata = { title: "Drift" };

export default async function DriftPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  return (
    <Suspense>
      <DriftScreen env={env} />
    </Suspense>
  );
}
