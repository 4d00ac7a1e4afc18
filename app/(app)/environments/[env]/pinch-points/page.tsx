import { Suspense } from "react";
import { PinchPoints } from "@/components/pinch-points/PinchPoints";

export const metadata = { title: "Pinch points" };

export default async function PinchPointsPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  return (
    <Suspense>
      <PinchPoints env={env} />
    </Suspense>
  );
}
