// The map's input, exactly as `GET /api/v1/environments/{env}/graph` serves it (lib/api/schemas/map.ts),
// and the map's own view types.
import type { ComponentKind } from "@/lib/inventory/types";
import type { MapNode } from "@/lib/api/schemas/map";

export { MAP_KINDS,  mapGraphSchema,  type MapEdge, type MapGraph, type MapMetrics, type MapNode } from "@/lib/api/schemas/map";

// Compile-time guard: the schema's kind must stay the inventory's ComponentKind.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const kindsAgree: Same<MapNode["kind"], ComponentKind> = true;
void kindsAgree;

export type Position = { x: number; y: number };
export type PinnedPositions = Record<string, Position>;

/** What the map colours nodes by. */
export const COLOUR_MODES = ["betweenness", "pinchScore", "blastDown", "entriesDominated", "tier", "team"] as const;
export type ColourMode = (typeof COLOUR_MODES)[number];
