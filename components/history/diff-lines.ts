// A snapshot diff as sentences a person can scan: "tier 2 → 1", "checkout now needs orders-db (hard)".
import type { ComponentChange, DependencyChange, SnapshotDependency } from "@/lib/api/schemas/history";

const show = (v: unknown): string => {
  if (v === null || v === undefined) return "none";
  if (Array.isArray(v)) return v.length ? v.join(", ") : "none";
  if (typeof v === "object") return Object.entries(v as Record<string, unknown>).map(([k, x]) => `${k}: ${String(x)}`).join(", ") || "none";
  return String(v);
};

export function fieldChanges(c: ComponentChange): string[] {
  return Object.entries(c.changes).map(([field, change]) => `${field}: ${show(change?.before)} → ${show(change?.after)}`);
}

export function dependencyLine(d: SnapshotDependency): string {
  const known = d.provenance?.filter((p) => p !== "declared") ?? [];
  return `${d.from} → ${d.to} (${d.strength}${d.group ? ", any-of group" : ""}${d.via ? `, via ${d.via}` : ""}${known.length ? `, ${known.join(" and ")}` : ""})`;
}

export function dependencyChangeLine(d: DependencyChange): string {
  return `${d.from} → ${d.to}: ${Object.entries(d.changes).map(([f, ch]) => `${f} ${show(ch?.before)} → ${show(ch?.after)}`).join("; ")}`;
}
