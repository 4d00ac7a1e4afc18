"use client";

import type { InferredNeed } from "@/lib/inventory/inferred";

const ROW_LIMIT = 200;
const td = "px-3 py-1.5 align-top";
const th = "px-3 py-1.5 text-left text-xs font-medium uppercase tracking-wide text-faint";

/** Needs read from configuration rather than declared: each with the variable or key and the reason, to check before pushing. */
export function InferredNeeds({ inferred }: { inferred: { total: number; needs: InferredNeed[] } }) {
  const rows = inferred.needs.slice(0, ROW_LIMIT);
  return (
    <section className="space-y-2" aria-label="Inferred needs" data-testid="inferred-needs">
      <h3 className="text-sm font-semibold">
        Needs inferred from configuration <span className="font-mono text-muted">({inferred.total})</span>
      </h3>
      <p className="text-xs text-muted">
        Host names in environment variables, env files, ConfigMaps, commands and arguments that name another component. Nothing declared them: check each reason. How they count
        (hard or soft) is an environment setting.
      </p>
      <div className="overflow-x-auto rounded-md border border-line">
        <table className="w-full text-sm">
          <thead className="bg-surface">
            <tr>
              {["Need", "Strength", "Via", "Reason", "Line"].map((h) => (
                <th key={h} className={th}>
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((n, i) => (
              <tr key={i} className="border-t border-line" data-testid="inferred-need">
                <td className={`${td} font-mono`}>
                  {n.from} → {n.to.length === 1 ? n.to[0] : `one of ${n.to.join(", ")}`}
                </td>
                <td className={td}>{n.strength === "startup" ? "start-up only" : n.strength}</td>
                <td className={`${td} font-mono text-xs`}>{n.via ?? "—"}</td>
                <td className={`${td} text-muted`}>{n.reason ?? "—"}</td>
                <td className={`${td} font-mono text-xs text-muted`}>{n.at?.line !== undefined ? `${n.at.file ? `${n.at.file}:` : ""}${n.at.line}:${n.at.column ?? 1}` : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {inferred.total > rows.length && <p className="text-xs text-muted">Showing the first {rows.length} of {inferred.total}.</p>}
    </section>
  );
}
