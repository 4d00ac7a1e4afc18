// Pinchpoint's node silhouettes, one per kind, drawn in a w×h box with its origin top-left.
// Each kind also carries a text label on the node, so shape is never the only cue.
import type { ComponentKind } from "@/lib/inventory/types";

export {  NODE_H, NODE_W,  TEAM_NODE_W } from "@/lib/map/elk";

export interface ShapePaths {
  /** outline, filled and stroked */
  outline: string;
  /** inner detail line(s), stroked only */
  detail: string | null;
}

const f = (n: number): string => (Math.round(n * 10) / 10).toString();

function roundedRect(w: number, h: number, r: number): string {
  return `M${f(r)},0 H${f(w - r)} A${f(r)},${f(r)} 0 0 1 ${f(w)},${f(r)} V${f(h - r)} A${f(r)},${f(r)} 0 0 1 ${f(w - r)},${f(h)} H${f(r)} A${f(r)},${f(r)} 0 0 1 0,${f(h - r)} V${f(r)} A${f(r)},${f(r)} 0 0 1 ${f(r)},0 Z`;
}

export function shapePaths(kind: ComponentKind, w: number, h: number): ShapePaths {
  switch (kind) {
    case "service":
      // the plain workhorse: a soft rectangle
      return { outline: roundedRect(w, h, 10), detail: null };
    case "datastore": {
      // a drum lying in the box: rims top and bottom
      const ry = 7;
      return {
        outline: `M0,${ry} A${f(w / 2)},${ry} 0 0 1 ${f(w)},${ry} V${f(h - ry)} A${f(w / 2)},${ry} 0 0 1 0,${f(h - ry)} Z`,
        detail: `M0,${ry} A${f(w / 2)},${ry} 0 0 0 ${f(w)},${ry}`,
      };
    }
    case "queue": {
      // a flag with a notched tail and a pointed head, plus an inner chevron: messages stacking up
      const k = 14;
      return {
        outline: `M0,0 H${f(w - k)} L${f(w)},${f(h / 2)} L${f(w - k)},${f(h)} H0 L${k},${f(h / 2)} Z`,
        detail: `M${f(w - k - 9)},4 L${f(w - 9)},${f(h / 2)} L${f(w - k - 9)},${f(h - 4)}`,
      };
    }
    case "cache": {
      // corners clipped off: a chip
      const c = 12;
      return {
        outline: `M${c},0 H${f(w - c)} L${f(w)},${c} V${f(h - c)} L${f(w - c)},${f(h)} H${c} L0,${f(h - c)} V${c} Z`,
        detail: `M${c + 4},${f(h - 6)} H${f(w - c - 4)}`,
      };
    }
    case "gateway":
      // an arched doorway: the way in
      return {
        outline: `M0,${f(h)} V${f(h * 0.42)} Q0,0 ${f(w / 2)},0 Q${f(w)},0 ${f(w)},${f(h * 0.42)} V${f(h)} Z`,
        detail: null,
      };
    case "network": {
      // a slanted band: a link between places
      const k = 14;
      return { outline: `M${k},0 H${f(w)} L${f(w - k)},${f(h)} H0 Z`, detail: null };
    }
    case "platform": {
      // a plinth, wider at the foot: what others stand on
      const k = 12;
      return { outline: `M${k},0 H${f(w - k)} L${f(w)},${f(h)} H0 Z`, detail: `M6,${f(h - 8)} H${f(w - 6)}` };
    }
    case "external": {
      // a capsule: somebody else's box
      const r = h / 2;
      return {
        outline: `M${f(r)},0 H${f(w - r)} A${f(r)},${f(r)} 0 0 1 ${f(w - r)},${f(h)} H${f(r)} A${f(r)},${f(r)} 0 0 1 ${f(r)},0 Z`,
        detail: null,
      };
    }
    case "job": {
      // a ticket with a folded corner: runs, then stops
      const c = 14;
      return { outline: `M0,0 H${f(w - c)} L${f(w)},${c} V${f(h)} H0 Z`, detail: `M${f(w - c)},0 V${c} H${f(w)}` };
    }
    case "telemetry": {
      // a soft box with a pulse trace across it: it watches, it serves nothing
      const y = h / 2;
      return {
        outline: roundedRect(w, h, 16),
        detail: `M6,${f(y)} H${f(w * 0.3)} L${f(w * 0.36)},${f(y - 9)} L${f(w * 0.44)},${f(y + 9)} L${f(w * 0.5)},${f(y)} H${f(w - 6)}`,
      };
    }
    case "undeclared":
      // square corners and (in the renderer) a dashed grey outline: a key nobody has declared
      return { outline: roundedRect(w, h, 3), detail: null };
  }
}

/** Horizontal room the text must leave so it stays inside the silhouette. */
export function textInset(kind: ComponentKind): { left: number; right: number } {
  switch (kind) {
    case "queue":
      return { left: 20, right: 24 };
    case "network":
      return { left: 18, right: 18 };
    case "external":
      return { left: 22, right: 22 };
    case "platform":
      return { left: 16, right: 16 };
    case "job":
      return { left: 12, right: 18 };
    default:
      return { left: 12, right: 12 };
  }
}

export const KIND_LABEL: Record<ComponentKind, string> = {
  service: "service",
  datastore: "datastore",
  queue: "queue",
  cache: "cache",
  gateway: "gateway",
  network: "network",
  platform: "platform",
  external: "external",
  job: "job",
  telemetry: "telemetry",
  undeclared: "undeclared",
};
