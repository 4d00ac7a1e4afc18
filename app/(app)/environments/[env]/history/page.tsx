import { notFound } from "next/navigation";
import { Suspense } from "react";
import { History } from "@/components/history/History";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "History" };

export default async function HistoryPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return (
    <Suspense>
      <History env={env} />
    </Suspense>
  );
}
