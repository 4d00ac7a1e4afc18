import { notFound } from "next/navigation";
import { MapScreen } from "@/components/map/MapScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const metadata = { title: "Map" };

export default async function MapPage({ params, searchParams }: { params: Promise<{ env: string }>; searchParams: Promise<{ focus?: string; incident?: string }> }) {
  const [{ env }, { focus, incident }, user] = await Promise.all([params, searchParams, requireUser()]);
  if (!SLUG_PATTERN.test(env)) notFound();
  return <MapScreen env={env} focus={focus ?? null} canEdit={roleHas(user.role, "components:annotate")} incident={incident === "current"} />;
}
