// Label selectors (Kubernetes "Labels and Selectors"): a Service's `selector` is equality-based
// (every key equals); a metav1.LabelSelector adds `matchExpressions` with In, NotIn, Exists and
// DoesNotExist, ANDed with `matchLabels`. An empty selector matches everything, a missing one nothing.
import type { LabelSelector } from "./schema";

export type Labels = Readonly<Record<string, string>>;

/** A Service's `spec.selector`. Empty or absent selects no Pods (the Service has hand-managed endpoints). */
export function serviceSelects(selector: Labels | null | undefined, labels: Labels): boolean {
  if (!selector) return false;
  const entries = Object.entries(selector);
  if (entries.length === 0) return false;
  return entries.every(([k, v]) => labels[k] === v);
}

/** A metav1.LabelSelector (PodDisruptionBudget, NetworkPolicy): `{}` selects every Pod of the namespace. */
export function labelSelectorMatches(selector: LabelSelector | null | undefined, labels: Labels): boolean {
  if (!selector) return false;
  for (const [k, v] of Object.entries(selector.matchLabels ?? {})) if (labels[k] !== v) return false;
  for (const req of selector.matchExpressions ?? []) {
    const has = Object.hasOwn(labels, req.key);
    const values = req.values ?? [];
    const value = labels[req.key];
    if (req.operator === "In" && !(has && value !== undefined && values.includes(value))) return false;
    if (req.operator === "NotIn" && has && value !== undefined && values.includes(value)) return false;
    if (req.operator === "Exists" && !has) return false;
    if (req.operator === "DoesNotExist" && has) return false;
  }
  return true;
}
