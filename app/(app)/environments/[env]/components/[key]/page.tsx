import { notFound } from "next/navigation";
import { ComponentPage } from "@/components/catalog/ComponentPage";
import { requireUser } from "@/lib/auth/page";
import { KEY_PATTERN, SLUG_PATTERN } from "@/lib/inventory/types";

export async function generateMetadata({ params }: { params: Promise<{ key: string }> }) {
  return { title: decodeURIComponent((await params).key) };
}

export default async function ComponentDetailPage({ params }: { params: Promise<{ env: string; key: string }> }) {
  await requireUser();
  const { env, key: raw } = await params;
  const key = decodeURIComponent(raw);
  if (!SLUG_PATTERN.test(env) || !KEY_PATTERN.test(key)) notFound();
  return <ComponentPage env={env} componentKey={key} />;
}
