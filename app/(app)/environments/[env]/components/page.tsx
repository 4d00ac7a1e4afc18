import { notFound } from "next/navigation";
import { Suspense } from "react";
import { ComponentList } from "@/components/catalog/ComponentList";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Components" };

export default async function ComponentsPage({ params }: { params: Promise<{ env: string }> }) {
  await requireUser();
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  return (
    <Suspense>
      <ComponentList env={env} />
    </Suspense>
  );
}
