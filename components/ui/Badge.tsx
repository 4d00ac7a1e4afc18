import type { ReactNode } from "react";

export type BadgeTone = "down" | "degraded" | "ok" | "info" | "cycle" | "undeclared" | "muted";

// Colour is never the only signal: every badge carries a word, the colour only helps scanning.
const TONES: Record<BadgeTone, string> = {
  down: "border-down/60 text-down bg-down/10",
  degraded: "border-degraded/60 text-degraded bg-degraded/10",
  ok: "border-ok/60 text-ok bg-ok/10",
  info: "border-info/60 text-info bg-info/10",
  cycle: "border-cycle/60 text-cycle bg-cycle/10",
  undeclared: "border-undeclared/60 text-undeclared bg-undeclared/10 border-dashed",
  muted: "border-line text-muted",
};

export function Badge({ tone = "muted", title, children }: { tone?: BadgeTone; title?: string; children: ReactNode }) {
  return (
    <span title={title} className={`inline-flex items-center whitespace-nowrap rounded border px-1.5 py-px text-[11px] font-medium leading-4 ${TONES[tone]}`}>
      {children}
    </span>
  );
}
