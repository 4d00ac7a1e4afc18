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
  // Trace, metric and log collectors and their agents. Losing one blinds the estate's
  // observability but takes no request down, so importers make needs *on* it soft by default.
  "telemetry",
] as const;
export type DeclaredKind = (typeof COMPONENT_KINDS)[number];
/** `undeclared` is never written in a file: it marks a placeholder for a key some source needs. */
export type ComponentKind = DeclaredKind | "undeclared";

/**
 * `hard`: the dependent is down while the need is unmet; `soft`: degraded, not down;
 * `startup`: needed only to start (a one-shot migration, a job that must finish first) — boot
 * order honours it, blast radius, drills and the failure measures do not.
 */
export const STRENGTHS = ["hard", "soft", "startup"] as const;
export type Strength = (typeof STRENGTHS)[number];

const STRENGTH_RANK: Record<Strength, number> = { hard: 2, soft: 1, startup: 0 };
/** The stronger of two claims about one need: a repeat or merge keeps what an outage would honour. */
export const strongerStrength = (a: Strength, b: Strength): Strength => (STRENGTH_RANK[a] >= STRENGTH_RANK[b] ? a : b);

/**
 * How Pinchpoint knows of a need: a file says so (`declared`), a host name in configuration named
 * it (`inferred`, with the variable or key in `via`), or traces saw calls (`observed`).
 */
export const PROVENANCES = ["declared", "inferred", "observed"] as const;
export type Provenance = (typeof PROVENANCES)[number];

/** Where something was written in an input file, for located previews, SARIF results and the component page. */
export interface FilePosition {
  /** The file's name within the push, when the push carried several. */
  file?: string;
  line?: number;
  column?: number;
}

export const TIERS = [1, 2, 3, 4] as const;
export type Tier = (typeof TIERS)[number];

export const KEY_PATTERN = /^[a-z0-9][a-z0-9._-]{0,127}$/;
export const SLUG_PATTERN = /^[a-z0-9][a-z0-9-]{0,62}$/;

/** One located problem in an input file. `path` is like `components[3].needs[1].key`. */
export interface InventoryIssue {
  path: string;
  /** The file it is in, when the push carried several (a layered Compose project). */
  file?: string;
  line?: number;
  column?: number;
  message: string;
}

/** A need on one component, or an any-of group met while any one member is up. */
interface NeedCommon {
  strength: Strength;
  via: string | null;
  /** Absent means `["declared"]`. Sorted, without repeats. */
  provenance?: Provenance[];
  at?: FilePosition;
  /**
   * Why an importer inferred the need, in words for the dry-run preview (names of variables,
   * keys and objects only, never a configuration value). Not stored.
   */
  reason?: string;
}

export type Need = ({ type: "single"; key: string } | { type: "any_of"; keys: string[] }) & NeedCommon;

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
  /** Other names the component is known by (trace service names, Compose or Kubernetes names). */
  aliases: string[];
  needs: Need[];
  at?: FilePosition;
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
  /**
   * What the importer read into the files beyond what they say outright (a start-up-only need, a
   * kind taken from an image name, a service left out by its profile), each with its reason, so a
   * dry-run preview can show them and the author can override them. Inferred needs carry their
   * own `reason` instead.
   */
  notes?: ImportNote[];
}

// Needs inferred from configuration are not notes: they carry their own `reason` (see Need).
export const IMPORT_NOTE_KINDS = ["startup-need", "soft-on-telemetry", "left-out", "kind-from-image", "kind-from-completion"] as const;
export type ImportNoteKind = (typeof IMPORT_NOTE_KINDS)[number];

/** One thing an importer inferred, with its reason and where in the files it comes from. */
export interface ImportNote {
  kind: ImportNoteKind;
  /** The component it concerns (for `left-out`: the service left out). */
  component: string;
  /** The need's target, for notes about a need. */
  target?: string;
  reason: string;
  at?: FilePosition;
}

/** One file of a push that carries several (a layered Compose project and its `.env`). */
export interface ImportFile {
  name: string;
  body: string | Uint8Array;
}

export const IMPORT_FORMATS = ["pinchpoint", "compose", "csv", "otlp", "kubernetes"] as const;
export type ImportFormat = (typeof IMPORT_FORMATS)[number];

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
  /**
   * Fill `at` on every component and need. Off by default: positions cost a full YAML parse that
   * a clean push does not otherwise need; previews and impact findings (SARIF) ask for them.
   * Importers that find positions anyway (inferred needs) may fill `at` regardless.
   */
  positions?: boolean;
  /**
   * Several files of one push, in order (base file first, then overrides, `.env` anywhere), from a
   * multipart body. When given, `body` is ignored. Only the Compose importer reads more than one.
   */
  files?: ImportFile[];
  /** Compose profiles to include besides the services that name none (`?profiles=a,b`). */
  profiles?: string[];
  /** Per-push settings of the `kubernetes` format (query parameters of the push). */
  kubernetes?: KubernetesImportOptions;
}

/** How a Kubernetes push maps names and owners; every field has a documented default (importers/README.md). */
export interface KubernetesImportOptions {
  /** The cluster's DNS domain, for `svc.ns.svc.<domain>` names. Default `cluster.local`. */
  clusterDomain?: string;
  /** Label or annotation key whose value is the owning team. Default `team`. */
  teamKey?: string;
  /** Namespace → team for this push; wins over what the Namespace objects say. */
  teams?: Record<string, string>;
  /** When nothing else names a team, the namespace's name is the team. Default false. */
  namespaceTeams?: boolean;
  /** Offer Service names and `app` labels as component aliases. Default true. */
  aliases?: boolean;
}
