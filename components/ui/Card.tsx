import type { ReactNode } from "react";

export function Card({ title, action, children, className = "" }: { title?: ReactNode; action?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-line bg-surface ${className}`}>
      {(title || action) && (
        <header className="flex items-center justify-between gap-3 border-b border-line px-4 py-2.5">
          {title && <h2 className="text-sm font-semibold text-ink">{title}</h2>}
          {action}
        </header>
      )}
      <div className="p-4">{children}</div>
    </section>
  );
}

export function Stat({ label, value, hint, tone = "ink" }: { label: string; value: ReactNode; hint?: ReactNode; tone?: "ink" | "down" | "degraded" | "ok" }) {
  const toneClass = { ink: "text-ink", down: "text-down", degraded: "text-degraded", ok: "text-ok" }[tone];
  return (
    <div className="rounded-lg border border-line bg-surface px-4 py-3" data-testid={`stat-${label.toLowerCase().replace(/\W+/g, "-")}`}>
      <div className="text-xs font-medium uppercase tracking-wide text-faint">{label}</div>
      <div className={`mt-1 font-mono text-3xl font-semibold tabular-nums ${toneClass}`}>{value}</div>
      {hint && <div className="mt-1 text-xs text-muted">{hint}</div>}
    </div>
  );
}
