// The normalised inventory: what every importer returns and what the data layer stores.
// Nothing here knows about YAML, HTTP or Sequelize.

export const COMPONENT_KINDS = [
  "service",
  "datastore",
  "queue",
  "cache",
  "gateway",
  "network",
  "platform",
  "external",
  "job",
] as const;
export type DeclaredKind = (typeof COMPONENT_KINDS)[number];
/** `undeclared` is never written in a file: it marks a placeholder for a key some source needs. */
export type ComponentKind = DeclaredKind | "undeclared";

export const STRENGTHS = ["hard", "soft"] as const;
export type Strength = (typeof STRENGTHS)[number];

export const TIERS = [1, 2, 3, 4] as const;
export type Tier = (typeof TIERS)[number];

export const KEY_PATTERN = /^[a-z0-9][a-z0-9._-]{0,127}$/;
export const SLUG_PATTERN = /^[a-z0-9][a-z0-9-]{0,62}$/;

/** One located problem in an input file. `path` is like `components[3].needs[1].key`. */
export interface InventoryIssue {
  path: string;
  line?: number;
  column?: number;
  message: string;
}

/** A need on one component, or an any-of group met while any one member is up. */
export type Need =
  | { type: "single"; key: string; strength: Strength; via: string | null }
  | { type: "any_of"; keys: string[]; strength: Strength; via: string | null };

export interface InventoryComponent {
  key: string;
  name: string;
  kind: DeclaredKind;
  team: string | null;
  tier: Tier;
  replicas: number;
  zones: string[];
  tags: string[];
  links: Record<string, string>;
  needs: Need[];
}

/** An edge seen in telemetry rather than declared; kept apart so drift can be shown. */
export interface ObservedEdge {
  from: string;
  to: string;
  /** How many spans gave evidence of this edge. */
  count: number;
  /** e.g. `span-parent`, `peer.service`, `db.system` */
  evidence: string;
}

export interface NormalisedInventory {
  source: string;
  /** Named in the file; must agree with the URL's environment when both are given. */
  environment: string | null;
  components: InventoryComponent[];
  observedEdges: ObservedEdge[];
  warnings: InventoryIssue[];
}

export type ImportFormat = "pinchpoint" | "compose" | "csv" | "otlp";

export type ImportResult =
  | { ok: true; inventory: NormalisedInventory }
  | { ok: false; status: 413 | 422; issues: InventoryIssue[] };

/**
 * Who declared a set of components (usually a repository). Slug-like, like keys: lower-case
 * letters, digits, `.`, `_` and `-`, so `storefront-repo` or `harbor.storefront`.
 */
export const SOURCE_PATTERN = /^[a-z0-9][a-z0-9._-]{0,127}$/;

/** What a caller hands to `importInventory`; `source` is required for every format but `pinchpoint`. */
export interface ImportRequest {
  format: ImportFormat;
  body: string | Uint8Array;
  contentType?: string;
  source?: string;
  environment?: string;
}
