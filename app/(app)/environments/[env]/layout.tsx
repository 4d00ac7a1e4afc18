// Every screen of one environment: a signed-in user, and an environment name that can exist.
// Checked once here instead of in each page; pages that need the user's role ask for it again,
// which costs nothing more (requireUser is cached per request). An environment that does not
// exist yet is not refused: its screens say so, and an admin's first push creates it.
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { requireUser } from "@/lib/auth/page";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export default async function EnvironmentLayout({ children, params }: { children: ReactNode; params: Promise<{ env: string }> }) {
  const { env } = await params;
  if (!SLUG_PATTERN.test(env)) notFound();
  await requireUser();
  return children;
}
