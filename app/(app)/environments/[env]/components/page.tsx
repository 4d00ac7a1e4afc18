import { Suspense } from "react";
import { ComponentList } from "@/components/components/ComponentList";

export const metadata = { title: "Components" };

export default async function ComponentsPage({ params }: { params: Promise<{ env: string }> }) {
  const { env } = await params;
  return (
    <Suspense>
      <ComponentList env={env} />
    </Suspense>
  );
}
