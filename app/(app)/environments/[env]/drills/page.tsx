import { notFound } from "next/navigation";
import { Suspense } from "react";
import { Drills } from "@/components/drills/Drills";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Drills" };

export default async function DrillsPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return (
    <Suspense>
      <Drills env={env} />
    </Suspense>
  );
}
