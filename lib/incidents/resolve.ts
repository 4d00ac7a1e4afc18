// Which component an alert is about. A Pinchpoint alert names it; an Alertmanager alert carries
// labels, and the environment's `alertLabels` setting says which of them may name a component, in
// order: the first whose value is a component key or alias wins. Keys are lower-case (format 1),
// so names match without regard to case. An alert that names nothing known is kept and listed,
// with the name it gave, so that someone can add the alias or fix the label.
//
// Prometheus data model: "Labels with an empty label value are considered equivalent to labels
// that do not exist" — an empty value is skipped like a missing label.
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import type { ReceivedAlert } from "./payload";

/** Lower-cased key or alias → key, for one snapshot. */
export type NameIndex = ReadonlyMap<string, string>;

export function nameIndex(content: Pick<SnapshotContent, "components">): NameIndex {
  const index = new Map<string, string>();
  for (const c of content.components) {
    index.set(c.key.toLowerCase(), c.key);
    for (const a of c.aliases ?? []) if (!index.has(a.toLowerCase())) index.set(a.toLowerCase(), c.key);
  }
  return index;
}

export interface Resolution {
  /** The component's key, or null when the alert names no known component. */
  key: string | null;
  /** What the alert called it: the Pinchpoint component, or the label that matched (else the first present). */
  named: { label: string | null; value: string } | null;
}

export function resolveAlert(alert: Pick<ReceivedAlert, "component" | "labels">, labels: readonly string[], index: NameIndex): Resolution {
  if (alert.component !== null) {
    return { key: index.get(alert.component.toLowerCase()) ?? null, named: { label: null, value: alert.component } };
  }
  let first: Resolution["named"] = null;
  for (const label of labels) {
    const value = alert.labels[label];
    if (!value) continue;
    const key = index.get(value.toLowerCase());
    if (key !== undefined) return { key, named: { label, value } };
    first ??= { label, value };
  }
  return { key: null, named: first };
}
