import { notFound } from "next/navigation";
import { Suspense } from "react";
import { PinchPoints } from "@/components/rankings/PinchPoints";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Pinch points" };

export default async function PinchPointsPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return (
    <Suspense>
      <PinchPoints env={env} />
    </Suspense>
  );
}
