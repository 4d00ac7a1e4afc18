import { Suspense } from "react";
import { PinchPoints } from "@/components/pinch-points/PinchPoints";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

export const metadata = { title: "Pinch points" };

export default async function PinchPointsPage({ params }: { params: Promise<{ env: string }> }) {
  const [{ env }, user] = await Promise.all([params, requireUser()]);
  return (
    <Suspense>
      <PinchPoints env={env} canDecide={roleHas(user.role, "reviews:write")} />
    </Suspense>
  );
}
