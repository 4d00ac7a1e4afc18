import type { ReactNode } from "react";

type Tone = "error" | "info" | "caution";

const TONES: Record<Tone, string> = {
  error: "border-down/50 bg-down/10",
  info: "border-info/40 bg-info/10",
  caution: "border-degraded/50 bg-degraded/10",
};

/** A one-paragraph message: errors are announced (role=alert), the rest are polite status. */
export function Notice({ tone = "info", title, children }: { tone?: Tone; title?: ReactNode; children?: ReactNode }) {
  return (
    <div role={tone === "error" ? "alert" : "status"} className={`rounded-md border px-3 py-2 text-sm text-ink ${TONES[tone]}`}>
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className="text-muted">{children}</div>}
    </div>
  );
}
