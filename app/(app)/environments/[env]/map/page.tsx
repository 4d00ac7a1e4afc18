import { MapScreen } from "@/components/map/MapScreen";
import { COLOUR_MODES, type ColourMode } from "@/components/map/types";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

export const metadata = { title: "Map" };

export default async function MapPage({ params, searchParams }: { params: Promise<{ env: string }>; searchParams: Promise<{ focus?: string; incident?: string; colour?: string }> }) {
  const [{ env }, { focus, incident, colour }, user] = await Promise.all([params, searchParams, requireUser()]);
  const mode = (COLOUR_MODES as readonly string[]).includes(colour ?? "") ? (colour as ColourMode) : null;
  return <MapScreen env={env} focus={focus ?? null} colour={mode} canEdit={roleHas(user.role, "components:annotate")} incident={incident === "current"} />;
}
