import { notFound } from "next/navigation";
import { DriftScreen } from "@/components/drift/DriftScreen";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Drift" };

export default async function DriftPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return <DriftScreen env={env} />;
}
