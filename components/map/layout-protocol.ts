// Messages between useElkLayout and layout.worker.ts (same build, so plain types suffice).
import type { LayoutInput, LayoutResult } from "./layout";

export type LayoutPhase = "graph" | "layout" | "read";

export const PHASE_LABEL: Record<LayoutPhase, string> = {
  graph: "Preparing graph",
  layout: "Placing components",
  read: "Drawing routes",
};

export type LayoutRequest = { type: "layout"; id: number; input: LayoutInput };

export type LayoutReply =
  | { type: "phase"; id: number; phase: LayoutPhase }
  | { type: "done"; id: number; result: LayoutResult; ms: number }
  | { type: "error"; id: number; message: string };
