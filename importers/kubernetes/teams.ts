// Who owns a Kubernetes component, and the per-push settings of the format.
// The first of these that names a team wins:
//   1. the object's own `pinchpoint/team` annotation, then its label or annotation `<team key>`
//      (default key `team`; `?team_key=` changes it, e.g. `app.kubernetes.io/part-of`);
//   2. the Pod template's label `<team key>`;
//   3. the push's namespace mapping, `?teams=shop:storefront,pay:payments`;
//   4. the Namespace object of the push: its `pinchpoint/team` annotation, then its label or
//      annotation `<team key>`;
//   5. with `?namespace_teams=true`, the namespace's own name.
// Otherwise the component is unowned. A value that is not a team slug is a warning (once per value)
// and leaves the component unowned rather than guessing.
import { SLUG_PATTERN, type InventoryIssue, type KubernetesImportOptions } from "@/lib/inventory/types";
import { formatPath, type PathSegment } from "../shared/text";
import { DEFAULT_CLUSTER_DOMAIN } from "./dns";
import type { ObjectMeta } from "./schema";
import type { Labels } from "./selectors";

/** The annotation prefix of everything Pinchpoint reads from a manifest: team, tier, kind, needs. */
export const PINCHPOINT_ANNOTATION = "pinchpoint/";
const DEFAULT_TEAM_KEY = "team";

export interface Settings {
  clusterDomain: string;
  teamKey: string;
  teams: ReadonlyMap<string, string>;
  namespaceTeams: boolean;
  aliases: boolean;
  issues: InventoryIssue[];
}

const DNS_NAME = /^[a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?(\.[a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?)*$/;
// Kubernetes "Labels and Selectors": an optional DNS-subdomain prefix and `/`, then a name of up to 63 characters.
const LABEL_KEY = /^([a-z0-9]([a-z0-9-.]{0,251}[a-z0-9])?\/)?[A-Za-z0-9]([A-Za-z0-9._-]{0,61}[A-Za-z0-9])?$/;
const NAMESPACE = /^[a-z0-9]([a-z0-9-]{0,61}[a-z0-9])?$/;

export function checkSettings(opts: KubernetesImportOptions): Settings {
  const issues: InventoryIssue[] = [];
  const domain = (opts.clusterDomain ?? DEFAULT_CLUSTER_DOMAIN).toLowerCase().replace(/\.$/, "");
  if (!DNS_NAME.test(domain)) issues.push({ path: "cluster_domain", message: `${JSON.stringify(opts.clusterDomain)} is not a DNS domain such as cluster.local` });
  const teamKey = opts.teamKey ?? DEFAULT_TEAM_KEY;
  if (!LABEL_KEY.test(teamKey)) issues.push({ path: "team_key", message: `${JSON.stringify(teamKey)} is not a label key (an optional DNS prefix and "/", then up to 63 letters, digits, "-", "_" or ".")` });
  const teams = new Map<string, string>();
  for (const [ns, team] of Object.entries(opts.teams ?? {})) {
    if (!NAMESPACE.test(ns)) issues.push({ path: "teams", message: `${JSON.stringify(ns)} is not a namespace name` });
    else if (!SLUG_PATTERN.test(team)) issues.push({ path: "teams", message: `${JSON.stringify(team)} (for namespace ${ns}) is not a team slug` });
    else teams.set(ns, team);
  }
  return { clusterDomain: domain, teamKey, teams, namespaceTeams: opts.namespaceTeams === true, aliases: opts.aliases !== false, issues };
}

export class Owners {
  private readonly warned = new Set<string>();

  constructor(
    private readonly settings: Settings,
    private readonly namespaces: ReadonlyMap<string, ObjectMeta>,
    private readonly warnings: InventoryIssue[],
  ) {}

  private named(meta: { labels?: Labels | null; annotations?: Labels | null } | undefined): string | undefined {
    if (!meta) return undefined;
    return meta.annotations?.[`${PINCHPOINT_ANNOTATION}team`] ?? meta.labels?.[this.settings.teamKey] ?? meta.annotations?.[this.settings.teamKey];
  }

  teamOf(namespace: string, meta: ObjectMeta, podLabels: Labels, path: PathSegment[]): string | null {
    const value =
      this.named(meta) ??
      podLabels[this.settings.teamKey] ??
      this.settings.teams.get(namespace) ??
      this.named(this.namespaces.get(namespace)) ??
      (this.settings.namespaceTeams ? namespace : undefined);
    if (value === undefined) return null;
    if (SLUG_PATTERN.test(value)) return value;
    if (!this.warned.has(value)) {
      this.warned.add(value);
      this.warnings.push({ path: formatPath(path), message: `team ${JSON.stringify(value)} (from ${namespace}/${meta.name}) is not a team slug (lower-case letters, digits and "-"): left unowned` });
    }
    return null;
  }
}
