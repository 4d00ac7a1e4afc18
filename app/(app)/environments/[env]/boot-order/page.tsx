import { notFound } from "next/navigation";
import { ColdStart } from "@/components/boot/ColdStart";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Cold start" };

export default async function ColdStartPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return <ColdStart env={env} />;
}
