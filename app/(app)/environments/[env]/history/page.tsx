import { Suspense } from "react";
import { History } from "@/components/history/History";

export const metadata = { title: "History" };

export default async function HistoryPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  return (
    <Suspense>
      <History env={env} />
    </Suspense>
  );
}
