// A push: parse → authorise the source → merge into the environment's graph → snapshot → queue
// analysis. All or nothing: one transaction, serialised per environment by an advisory lock, so
// concurrent pushes never lose each other's work and a failed push writes nothing at all.
import "server-only";
import type { Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { recordAudit, type SystemActor } from "./audit";
import { loadCurrentContent, needOriginKey, refreshNeedOrigins, writeSourceRows, type NeedOrigins } from "./graph-content";
import { observedOverlay } from "./observed-graph";
import { insertSnapshot, latestSnapshot } from "./snapshot-insert";
import { pushTraceFile } from "./traces";
import { checkMayReplaceSource } from "./source-ownership";
import { AppError, notFound } from "@/lib/errors";
import { importInventoryOffThread } from "@/importers/off-thread";
import { mergeSources } from "@/lib/inventory/merge";
import { diffSnapshots, snapshotHash, type SnapshotContent, type SnapshotDiff } from "@/lib/inventory/snapshot";
import { inferredNeedsOf, type InferredNeed } from "@/lib/inventory/inferred";
import type { ImpactReport } from "@/lib/impact";
import { impactForPush } from "./impact";
import type { ImportFile, ImportFormat, ImportNote, InventoryIssue, KubernetesImportOptions, NormalisedInventory } from "@/lib/inventory/types";

export type PushActor = Actor | (SystemActor & { canCreateEnvironments: true });

export interface PushInput {
  environment: string;
  format: ImportFormat;
  body: string | Buffer;
  /** Several files of one push (a layered Compose project); `body` is then ignored. */
  files?: ImportFile[];
  /** Compose profiles to include. */
  profiles?: string[];
  contentType?: string | null;
  /** required for every format but `pinchpoint`, whose files name their source */
  source?: string | null;
  dryRun: boolean;
  actor: PushActor;
  /** Settings of the `kubernetes` format (its query parameters). */
  kubernetes?: KubernetesImportOptions;
  /** Report what the change does to the failure points and how it fares against the change policies. */
  impact?: boolean;
  /** Why an architect or admin pushes a change that a blocking policy refuses (audited). */
  overrideReason?: string | null;
}

export interface PushResult {
  changed: boolean;
  dryRun: boolean;
  snapshot: { id: string; number: number; createdAt: string } | null;
  diff: DiffSummary;
  warnings: InventoryIssue[];
  /** What the importer inferred beyond what the files say, each with its reason (see ImportNote). */
  notes?: ImportNote[];
  /** trace files: distinct observed edges, spans read, calls counted, repeated spans skipped */
  observed?: { edges: number; spans: number; calls: number; duplicates: number };
  /** Needs the importer inferred from configuration, each with its reason and position (dry runs only). */
  inferred?: { total: number; needs: InferredNeed[] };
  /** The change's impact (lib/impact), when asked for or when a blocking policy held the push to it. */
  impact?: ImpactReport;
}

export interface DiffSummary extends SnapshotDiff {
  counts: { componentsAdded: number; componentsRemoved: number; componentsChanged: number; dependenciesAdded: number; dependenciesRemoved: number };
}

export function summariseDiff(diff: SnapshotDiff): DiffSummary {
  return {
    ...diff,
    counts: {
      componentsAdded: diff.componentsAdded.length,
      componentsRemoved: diff.componentsRemoved.length,
      componentsChanged: diff.componentsChanged.length,
      dependenciesAdded: diff.dependenciesAdded.length,
      dependenciesRemoved: diff.dependenciesRemoved.length,
    },
  };
}

/** May this caller create an environment on its first push? Admin users, and tokens bound to no environment. */
function mayCreateEnvironment(actor: PushActor): boolean {
  if (actor.type === "system") return actor.canCreateEnvironments;
  if (actor.type === "user") return actor.role === "admin";
  return actor.environmentId === null && actor.creator.role === "admin";
}

function checkBinding(actor: PushActor, environmentId: string | null, source: string): void {
  if (actor.type !== "token") return;
  if (actor.environmentId && actor.environmentId !== environmentId) {
    throw new AppError("forbidden", "This token is bound to another environment");
  }
  if (actor.sourceName && actor.sourceName !== source) {
    throw new AppError("forbidden", `This token may push only source "${actor.sourceName}", not "${source}"`);
  }
}

async function parse(input: PushInput): Promise<NormalisedInventory> {
  // A Compose file may name its source (x-pinchpoint.source); the importer says so when neither does.
  if (input.format !== "pinchpoint" && input.format !== "compose" && !input.source) {
    throw new AppError("invalid_request", `The ${input.format} format needs ?source=<name>: the file does not say who declared it`);
  }
  if (input.files && input.files.length > 1 && input.format !== "compose") {
    throw new AppError("invalid_request", `Only the compose format reads several files in one push; send one ${input.format} file`);
  }
  // On a worker thread with a time budget: a slow file must not hold up other requests.
  const result = await importInventoryOffThread({
    format: input.format,
    body: input.files?.length === 1 && input.format !== "compose" ? (input.files[0]?.body ?? input.body) : input.body,
    ...(input.format === "compose" && input.files ? { files: input.files } : {}),
    ...(input.profiles ? { profiles: input.profiles } : {}),
    contentType: input.contentType ?? undefined,
    source: input.source ?? undefined,
    environment: input.environment,
    kubernetes: input.kubernetes,
    // Findings point at lines only where the importer kept them.
    positions: input.impact === true,
  });
  if (!result.ok) {
    throw new AppError(result.status === 413 ? "payload_too_large" : "invalid_inventory", result.status === 413 ? "The inventory is over a limit" : "The inventory has errors; nothing was changed", result.issues);
  }
  const inventory = result.inventory;
  if (input.format === "pinchpoint" && input.source && input.source !== inventory.source) {
    throw new AppError("invalid_inventory", "The file's source does not match ?source=", [
      { path: "source", message: `the file says "${inventory.source}" but the request says "${input.source}"` },
    ]);
  }
  if (inventory.environment && inventory.environment !== input.environment) {
    throw new AppError("invalid_inventory", "The file names another environment", [
      { path: "environment", message: `the file says "${inventory.environment}" but it was pushed to "${input.environment}"` },
    ]);
  }
  return inventory;
}

/** Positions the importer found for needs (inferred ones carry theirs), keyed like the dependency rows. */
function needOrigins(inventory: NormalisedInventory): NeedOrigins {
  const out = new Map<string, NonNullable<NormalisedInventory["components"][number]["at"]>>();
  for (const c of inventory.components) {
    for (const need of c.needs) {
      if (!need.at) continue;
      for (const k of need.type === "single" ? [need.key] : need.keys) out.set(needOriginKey(c.key, k), need.at);
    }
  }
  return out;
}

class DryRunRollback extends Error {
  constructor(readonly result: PushResult) {
    super("dry run");
  }
}

export async function pushInventory(input: PushInput): Promise<PushResult> {
  if (input.format === "otlp") {
    // Traces are folded into aggregates, not merged as declarations (lib/data/traces.ts).
    const body = typeof input.body === "string" ? Buffer.from(input.body) : input.body;
    return pushTraceFile({ environment: input.environment, source: input.source ?? null, dryRun: input.dryRun, actor: input.actor, chunks: (async function* () {
      yield body;
    })() });
  }
  const inventory = await parse(input);
  const { sequelize } = db();
  try {
    return await sequelize.transaction(async (transaction) => {
      const environment = await lockEnvironment(input, inventory.source, transaction);
      const result = await applyInventory({ input, inventory, environment, transaction });
      // A dry run does every step of a real push, then rolls it all back.
      if (input.dryRun) throw new DryRunRollback(result);
      return result;
    });
  } catch (error) {
    if (error instanceof DryRunRollback) return error.result;
    throw error;
  }
}

export async function lockEnvironment(input: Pick<PushInput, "environment" | "actor">, source: string, transaction: Transaction): Promise<{ id: string; slug: string }> {
  const { sequelize, models } = db();
  // Serialise pushes per environment slug (the environment may not exist yet).
  await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-env:' || :slug))", {
    replacements: { slug: input.environment },
    transaction,
  });
  let env = await models.Environment.findOne({ where: { slug: input.environment }, transaction });
  if (!env) {
    if (!mayCreateEnvironment(input.actor)) throw notFound(`Environment "${input.environment}"`);
    checkBinding(input.actor, null, source);
    env = await models.Environment.create({ slug: input.environment, name: input.environment, pinchWeights: null }, { transaction });
    await recordAudit({ actor: input.actor, action: "environment.create", targetType: "environment", targetId: env.slug, environmentId: env.id, after: { slug: env.slug } }, transaction);
  } else {
    checkBinding(input.actor, env.id, source);
  }
  return { id: env.id, slug: env.slug };
}

async function applyInventory({
  input,
  inventory,
  environment,
  transaction,
}: {
  input: PushInput;
  inventory: NormalisedInventory;
  environment: { id: string; slug: string };
  transaction: Transaction;
}): Promise<PushResult> {
  const { models } = db();
  const [sourceRow] = await models.Source.findOrCreate({
    where: { environmentId: environment.id, name: inventory.source },
    defaults: { environmentId: environment.id, name: inventory.source, lastFormat: input.format, lastPushAt: new Date() },
    transaction,
  });
  const previous = await loadCurrentContent({ environmentId: environment.id }, transaction);
  await checkMayReplaceSource({ actor: input.actor, source: inventory.source, current: previous }, transaction);

  // Observed components and needs are laid over the declared graph, never merged as a source's.
  const overlay = await observedOverlay({ environmentId: environment.id }, transaction);
  const merged = mergeSources({ existing: overlay.strip(previous), source: inventory.source, incoming: inventory });
  const first = merged.conflicts[0];
  if (first) {
    throw new AppError(
      "conflict",
      `${first.message} (this push is "${inventory.source}")`,
      merged.conflicts.map((c) => ({ path: `components[key=${c.key}]`, message: c.message })),
    );
  }
  const next: SnapshotContent = overlay.apply(merged.content);
  // The merge's warnings start with the importer's own: take them once.
  const warnings = merged.warnings;
  const aliasesChanged = merged.aliasesChanged;
  const origins = needOrigins(inventory);

  const latest = await latestSnapshot({ environmentId: environment.id }, transaction);
  const hash = snapshotHash(next);
  const changed = latest ? latest.hash !== hash : next.components.length > 0;
  const diff = summariseDiff(diffSnapshots(previous, next));
  const impact = await impactForPush(
    { environment, previous, next, diff, inventory, snapshot: latest?.number ?? null, changed, requested: input.impact === true, dryRun: input.dryRun, overrideReason: input.overrideReason ?? null, actor: input.actor },
    transaction,
  );
  // The tables always hold the latest snapshot's graph, so identical content needs no rewrite.
  if (changed) {
    await writeSourceRows(
      { environmentId: environment.id, sourceId: sourceRow.id, sourceName: inventory.source, content: next, origins, allDependencies: aliasesChanged },
      transaction,
    );
    await overlay.write({ previous, next, pushingSource: inventory.source }, transaction);
  } else if (origins.size > 0 && !input.dryRun) {
    await refreshNeedOrigins({ sourceId: sourceRow.id, origins }, transaction);
  }

  let snapshot: PushResult["snapshot"] = null;
  if (changed && !input.dryRun) {
    snapshot = await insertSnapshot(
      { environmentId: environment.id, number: (latest?.number ?? 0) + 1, hash, content: next, sourceName: inventory.source, format: input.format, actorLabel: input.actor.label },
      transaction,
    );
  }

  await sourceRow.update({ lastFormat: input.format, lastPushAt: new Date() }, { transaction });
  await models.ImportRecord.create(
    {
      environmentId: environment.id,
      sourceName: inventory.source,
      format: input.format,
      actorLabel: input.actor.label,
      graphChanged: changed,
      snapshotNumber: snapshot?.number ?? null,
      summary: { ...diff.counts, components: next.components.length, dependencies: next.dependencies.length },
      warnings,
    },
    { transaction },
  );
  await recordAudit(
    {
      actor: input.actor,
      action: "inventory.push",
      targetType: "source",
      targetId: `${environment.slug}/${inventory.source}`,
      environmentId: environment.id,
      before: latest ? { snapshot: latest.number } : null,
      after: { snapshot: snapshot?.number ?? latest?.number ?? null, changed, format: input.format, ...diff.counts },
    },
    transaction,
  );
  return {
    changed,
    dryRun: input.dryRun,
    snapshot,
    diff,
    warnings,
    ...(inventory.notes && inventory.notes.length > 0 ? { notes: inventory.notes } : {}),
    ...(input.dryRun ? inferredNeedsOf(inventory) : {}),
    ...(impact ? { impact } : {}),
  };
}
