import { notFound } from "next/navigation";
import { ComponentPage } from "@/components/components/ComponentPage";
import { KEY_PATTERN } from "@/lib/inventory/types";

export async function generateMetadata({ params }: { params: Promise<{ key: string }> }) {
  return { title: decodeURIComponent((await params).key) };
}

export default async function ComponentDetailPage({ params }: { params: Promise<{ env: string; key: string }> }) {
  const { env, key: raw } = await params;
  const key = decodeURIComponent(raw);
  if (!KEY_PATTERN.test(key)) notFound();
  return <ComponentPage env={env} componentKey={key} />;
}
