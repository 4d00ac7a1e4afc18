import { notFound } from "next/navigation";
import { ComponentPage } from "@/components/components/ComponentPage";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { ownerViewerFor } from "@/lib/data/teams";
import { KEY_PATTERN } from "@/lib/inventory/types";

export async function generateMetadata({ params }: { params: Promise<{ key: string }> }) {
  return { title: decodeURIComponent((await params).key) };
}

export default async function ComponentDetailPage({ params }: { params: Promise<{ env: string; key: string }> }) {
  const [{ env, key: raw }, user] = await Promise.all([params, requireUser()]);
  const key = decodeURIComponent(raw);
  if (!KEY_PATTERN.test(key)) notFound();
  // Who may claim or assign an owner here: the rule annotateComponent applies on the server.
  const viewer = await ownerViewerFor(user);
  return <ComponentPage env={env} componentKey={key} viewer={viewer} canDecide={roleHas(user.role, "reviews:write")} />;
}
