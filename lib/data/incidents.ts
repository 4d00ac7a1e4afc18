// Live incidents: alerts in through an environment's webhook, the probable origin out.
//
// Contract of receiveAlerts: the body is parsed whole before anything is written (a bad one is a
// 422 that changes nothing); then one transaction, serialised per environment, applies every alert
// and records one audit event:
//   - a firing alert whose fingerprint is firing already is a repeat (its details refresh);
//   - a new one joins the environment's open incident, opening one (numbered per environment) when
//     none is open; a firing notice for an alert already resolved with the same start is a late
//     delivery and changes nothing;
//   - a resolved alert closes its firing row; one never seen firing is counted, not stored;
//   - when the last firing alert of an incident resolves, the incident resolves at that time.
// Each change re-ranks the firing components on the newest snapshot and keeps the ranking on the
// incident (the latest, and the one from when the most components fired, for history).
//
// Reads work out which component each alert means under the current inventory and label setting,
// so an alias pushed during an incident takes effect at once; the origin computation is cached per
// (snapshot, settings, firing set) because every open screen polls it.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { probableOrigin, type OriginResult } from "@/lib/analysis/origin";
import { analysisSettingsKey } from "@/lib/analysis/input";
import { readSettings, type EnvironmentSettings } from "@/lib/inventory/settings";
import { AppError, notFound } from "@/lib/errors";
import type { ParsedAlerts, ReceivedAlert } from "@/lib/incidents/payload";
import { nameIndex, resolveAlert, type NameIndex } from "@/lib/incidents/resolve";
import { PREDICTED_LIST_CAP, type CurrentIncidentResponse, type IncidentAlert, type IncidentDetailResponse, type IncidentHistoryResponse, type IncidentRow, type ReceiveAlertsResponse, type StoredRanking } from "@/lib/incidents/types";
import { INCIDENT_CAUTION, incidentSummaryText, pageOrder, type PageEntry, type UnknownAlertGroup } from "@/lib/incidents/view";
import { recordAudit, type SystemActor } from "./audit";
import { orderSql } from "./list-sql";
import { orderOf } from "@/lib/api/schemas/common";
import { INCIDENT_LIST, type IncidentsQuery } from "@/lib/api/schemas/incidents";
import { getEnvironmentOrThrow } from "./environments";
import { effectiveOwners, getSnapshotGraph, teamContacts } from "./snapshot-graph";

interface AlertRow {
  id: string;
  fingerprint: string;
  format: "pinchpoint" | "alertmanager";
  name: string | null;
  component: string | null;
  labels: Record<string, string>;
  severity: string | null;
  summary: string | null;
  link: string | null;
  starts_at: Date;
  ends_at: Date | null;
  last_received_at: Date;
}

interface IncidentDbRow {
  id: string;
  number: number;
  opened_at: Date;
  resolved_at: Date | null;
  resolved_by: string | null;
  peak_firing: number;
  ranking: StoredRanking | null;
  peak_ranking: StoredRanking | null;
  alert_count: string;
  firing_alerts: string;
}

const ALERT_COLUMNS = "id, fingerprint, format, name, component, labels, severity, summary, link, starts_at, ends_at, last_received_at";
const INCIDENT_SELECT = `SELECT i.id, i.number, i.opened_at, i.resolved_at, i.resolved_by, i.peak_firing, i.ranking, i.peak_ranking,
         (SELECT count(*) FROM alerts a WHERE a.incident_id = i.id) AS alert_count,
         (SELECT count(*) FROM alerts a WHERE a.incident_id = i.id AND a.ends_at IS NULL) AS firing_alerts
    FROM incidents i`;

function toIncidentRow(r: IncidentDbRow, which: "peak" | "latest"): IncidentRow {
  return {
    number: r.number,
    status: r.resolved_at ? "resolved" : "open",
    openedAt: r.opened_at.toISOString(),
    resolvedAt: r.resolved_at?.toISOString() ?? null,
    resolvedBy: r.resolved_by,
    peakFiring: r.peak_firing,
    alertCount: Number(r.alert_count),
    firingAlerts: Number(r.firing_alerts),
    ranking: which === "peak" ? (r.peak_ranking ?? r.ranking) : (r.ranking ?? r.peak_ranking),
  };
}

// ---------------------------------------------------------------------------------------------
// The graph an incident is read against, and the origin computation.

interface Context {
  snapshot: { id: string; number: number; createdAt: string } | null;
  settings: EnvironmentSettings;
  index: NameIndex;
}

async function readContext({ environmentId }: { environmentId: string }, transaction?: Transaction): Promise<Context> {
  const [row] = await db().sequelize.query<{ settings: unknown; id: string | null; number: number | null; created_at: Date | null }>(
    `SELECT e.settings, s.id, s.number, s.created_at FROM environments e
       LEFT JOIN LATERAL (SELECT id, number, created_at FROM snapshots WHERE environment_id = e.id ORDER BY number DESC LIMIT 1) s ON true
      WHERE e.id = :environmentId`,
    { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
  );
  if (!row) throw notFound("Environment");
  const settings = readSettings(row.settings);
  if (!row.id || row.number === null || !row.created_at) return { snapshot: null, settings, index: new Map() };
  const { content } = await getSnapshotGraph({ snapshotId: row.id });
  return { snapshot: { id: row.id, number: row.number, createdAt: row.created_at.toISOString() }, settings, index: cachedIndex(row.id, content) };
}

const holder = globalThis as unknown as { __pinchpointOrigins?: Map<string, OriginResult>; __pinchpointNames?: Map<string, NameIndex> };
const originCache = (holder.__pinchpointOrigins ??= new Map());
const nameCache = (holder.__pinchpointNames ??= new Map());
const CACHE_SIZE = 16;

function remember<T>(cache: Map<string, T>, key: string, make: () => T): T {
  const hit = cache.get(key);
  if (hit !== undefined) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const value = make();
  cache.set(key, value);
  while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  return value;
}

const cachedIndex = (snapshotId: string, content: Parameters<typeof nameIndex>[0]) => remember(nameCache, snapshotId, () => nameIndex(content));

interface Analysis {
  alerts: IncidentAlert[];
  result: OriginResult;
  unknownAlerts: UnknownAlertGroup[];
  page: PageEntry[];
}

const EMPTY_RESULT: OriginResult = { firing: [], unknown: [], origins: [], explainedCount: 0, jointly: [], unexplained: [], ranking: [], silent: [], pagerank: [], predicted: { down: [], degraded: [] } };

function toAlert(r: AlertRow, ctx: Context): IncidentAlert {
  const res = resolveAlert({ component: r.component, labels: r.labels }, ctx.settings.alertLabels, ctx.index);
  return {
    id: r.id,
    fingerprint: r.fingerprint,
    format: r.format,
    name: r.name,
    severity: r.severity,
    summary: r.summary,
    link: r.link,
    startsAt: r.starts_at.toISOString(),
    endsAt: r.ends_at?.toISOString() ?? null,
    lastReceivedAt: r.last_received_at.toISOString(),
    component: res.key,
    named: res.named,
  };
}

function unknownGroups(alerts: readonly IncidentAlert[]): UnknownAlertGroup[] {
  const groups = new Map<string, UnknownAlertGroup>();
  for (const a of alerts) {
    if (a.component !== null) continue;
    const id = `${a.named?.label ?? ""}\u0000${a.named?.value ?? ""}`;
    const g = groups.get(id) ?? { value: a.named?.value ?? null, label: a.named?.label ?? null, alerts: 0 };
    g.alerts++;
    groups.set(id, g);
  }
  return [...groups.values()].sort((a, b) => b.alerts - a.alerts || (a.value ?? "").localeCompare(b.value ?? ""));
}

async function analyse({ environmentId, rows, ctx }: { environmentId: string; rows: AlertRow[]; ctx: Context }): Promise<Analysis> {
  const alerts = rows.map((r) => toAlert(r, ctx));
  const unknownAlerts = unknownGroups(alerts);
  const firing = [...new Set(alerts.flatMap((a) => (a.component ? [a.component] : [])))].sort();
  if (!ctx.snapshot || firing.length === 0) return { alerts, result: { ...EMPTY_RESULT, unknown: [] }, unknownAlerts, page: [] };
  const { graph } = await getSnapshotGraph({ snapshotId: ctx.snapshot.id });
  const cacheKey = `${ctx.snapshot.id}/${analysisSettingsKey(ctx.settings)}/${firing.join(",")}`;
  const result = remember(originCache, cacheKey, () => probableOrigin(graph, firing));
  const [assigned, contacts] = await Promise.all([effectiveOwners({ environmentId }), teamContacts()]);
  const teamOf = (key: string): string | null => {
    if (assigned.has(key)) return assigned.get(key) ?? null;
    const v = graph.indexOf.get(key);
    return v === undefined ? null : (graph.team[v] ?? null);
  };
  return { alerts, result, unknownAlerts, page: pageOrder(result, teamOf, contacts) };
}

function storedRanking(a: Analysis, ctx: Context): StoredRanking {
  const r = a.result;
  return {
    computedAt: new Date().toISOString(),
    snapshot: ctx.snapshot ? { number: ctx.snapshot.number, createdAt: ctx.snapshot.createdAt } : null,
    firing: r.firing,
    alerts: a.alerts.length,
    unknownAlerts: a.unknownAlerts,
    origins: r.origins.map((o) => ({ key: o.key, explains: o.explains.length, degraded: o.degraded.length, newlyExplained: o.newlyExplained.length })),
    explainedCount: r.explainedCount,
    jointly: r.jointly,
    unexplained: r.unexplained,
    silent: r.silent.map((s) => ({ kind: s.kind, key: s.key, explains: s.explains.length })),
    pagerank: r.pagerank.slice(0, 10),
    ranking: r.ranking.slice(0, 10).map((x) => ({ key: x.key, explains: x.explains })),
    predicted: { down: r.predicted.down.length, degraded: r.predicted.degraded.length, firstDown: r.predicted.down.slice(0, 20) },
  };
}

// ---------------------------------------------------------------------------------------------
// Alerts in.

async function countFiring(incidentId: string, transaction: Transaction): Promise<number> {
  const [row] = await db().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM alerts WHERE incident_id = $1 AND ends_at IS NULL", { type: QueryTypes.SELECT, bind: [incidentId], transaction });
  return Number(row?.n ?? 0);
}

interface Pending {
  fingerprint: string;
  alert: ReceivedAlert;
  startsAt: Date;
  endsAt: Date | null;
}

/** A sender's clock may run ahead: a start or an end is never after now, and an end never before its start. */
const clampEnd = (end: Date | null, start: Date, now: Date): Date => new Date(Math.max(start.getTime(), Math.min((end ?? now).getTime(), now.getTime())));

export async function receiveAlerts({ slug, actor, parsed }: { slug: string; actor: Actor | SystemActor; parsed: ParsedAlerts }): Promise<ReceiveAlertsResponse> {
  const environment = await getEnvironmentOrThrow({ slug });
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, bind, transaction });
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-alerts:' || $1))", { bind: [environment.id], transaction });
    const now = new Date();
    const ctx = await readContext({ environmentId: environment.id }, transaction);

    const fingerprints = [...new Set(parsed.alerts.map((a) => a.fingerprint))];
    const firingRows = await q<{ id: string; fingerprint: string; starts_at: Date }>(
      "SELECT id, fingerprint, starts_at FROM alerts WHERE environment_id = $1 AND ends_at IS NULL AND fingerprint = ANY($2)",
      [environment.id, fingerprints],
    );
    const closedRows = await q<{ fingerprint: string; starts_at: Date }>(
      "SELECT fingerprint, starts_at FROM alerts WHERE environment_id = $1 AND ends_at IS NOT NULL AND fingerprint = ANY($2)",
      [environment.id, fingerprints],
    );
    const firing = new Map(firingRows.map((r) => [r.fingerprint, r]));
    const closed = new Set(closedRows.map((r) => `${r.fingerprint}\u0000${r.starts_at.getTime()}`));

    // Decide every alert in memory first; alerts repeated within one request apply in order.
    const inserts = new Map<string, Pending>();
    const refresh = new Map<string, ReceivedAlert>();
    const resolve = new Map<string, { id: string; endsAt: Date; alert: ReceivedAlert }>();
    const counts = { opened: 0, repeated: 0, resolved: 0, unmatched: 0, late: 0 };
    for (const a of parsed.alerts) {
      const fp = a.fingerprint;
      const known = firing.get(fp);
      const pending = inserts.get(fp);
      if (a.status === "firing") {
        if (pending && pending.endsAt === null) {
          pending.alert = a;
          counts.repeated++;
        } else if (known && !resolve.has(fp)) {
          refresh.set(fp, a);
          counts.repeated++;
        } else if (a.startsAt && closed.has(`${fp}\u0000${a.startsAt.getTime()}`)) {
          counts.late++;
        } else {
          inserts.set(fp, { fingerprint: fp, alert: a, startsAt: a.startsAt && a.startsAt < now ? a.startsAt : now, endsAt: null });
          counts.opened++;
        }
      } else if (pending && pending.endsAt === null) {
        pending.endsAt = clampEnd(a.endsAt, pending.startsAt, now);
        counts.resolved++;
      } else if (known && !resolve.has(fp)) {
        resolve.set(fp, { id: known.id, endsAt: clampEnd(a.endsAt, known.starts_at, now), alert: a });
        refresh.delete(fp);
        counts.resolved++;
      } else {
        counts.unmatched++;
      }
    }

    // The open incident, or a new one when something starts firing with none open.
    let [incident] = await q<{ id: string; number: number; opened_at: Date }>(
      "SELECT id, number, opened_at FROM incidents WHERE environment_id = $1 AND resolved_at IS NULL FOR UPDATE",
      [environment.id],
    );
    let openedIncident = false;
    if (!incident && inserts.size > 0) {
      const openedAt = new Date(Math.min(...[...inserts.values()].map((p) => p.startsAt.getTime())));
      [incident] = await q<{ id: string; number: number; opened_at: Date }>(
        `INSERT INTO incidents (environment_id, number, opened_at)
         VALUES ($1, (SELECT COALESCE(max(number), 0) + 1 FROM incidents WHERE environment_id = $1), $2)
         RETURNING id, number, opened_at`,
        [environment.id, openedAt],
      );
      openedIncident = true;
    }

    const rows = (m: Iterable<[string, ReceivedAlert]>) =>
      [...m].map(([fp, a]) => ({ fp, name: a.name, component: a.component, labels: a.labels, severity: a.severity, summary: a.summary, link: a.link }));
    if (inserts.size > 0 && incident) {
      const values = [...inserts.values()].map((p) => ({ ...rows([[p.fingerprint, p.alert]])[0]!, format: p.alert.format, starts: p.startsAt.toISOString(), ends: p.endsAt?.toISOString() ?? null }));
      await sequelize.query(
        `INSERT INTO alerts (environment_id, incident_id, fingerprint, format, name, component, labels, severity, summary, link, starts_at, ends_at, first_received_at, last_received_at)
         SELECT $1, $2, fp, format, name, component, labels, severity, summary, link, starts, ends, $4, $4
           FROM jsonb_to_recordset($3::jsonb) AS t(fp text, format text, name text, component text, labels jsonb, severity text, summary text, link text, starts timestamptz, ends timestamptz)`,
        { bind: [environment.id, incident.id, JSON.stringify(values), now], transaction },
      );
      const earliest = Math.min(...values.map((v) => Date.parse(v.starts)));
      if (earliest < incident.opened_at.getTime()) {
        await sequelize.query("UPDATE incidents SET opened_at = $2, updated_at = now() WHERE id = $1", { bind: [incident.id, new Date(earliest)], transaction });
      }
    }
    if (refresh.size > 0) {
      await sequelize.query(
        `UPDATE alerts a SET name = t.name, labels = t.labels, severity = t.severity, summary = t.summary, link = t.link, last_received_at = $3
           FROM jsonb_to_recordset($2::jsonb) AS t(fp text, name text, component text, labels jsonb, severity text, summary text, link text)
          WHERE a.environment_id = $1 AND a.fingerprint = t.fp AND a.ends_at IS NULL`,
        { bind: [environment.id, JSON.stringify(rows(refresh)), now], transaction },
      );
    }
    if (resolve.size > 0) {
      const values = [...resolve.values()].map((r) => ({ id: r.id, ends: r.endsAt.toISOString() }));
      await sequelize.query(
        `UPDATE alerts a SET ends_at = t.ends, last_received_at = $2 FROM jsonb_to_recordset($1::jsonb) AS t(id uuid, ends timestamptz) WHERE a.id = t.id`,
        { bind: [JSON.stringify(values), now], transaction },
      );
    }

    // Close the incident when nothing fires any more; otherwise re-rank what fires.
    let status: "open" | "resolved" | null = incident ? "open" : null;
    let firingAlerts = 0;
    const changed = counts.opened + counts.resolved > 0;
    if (incident && changed) {
      const open = await q<AlertRow>(`SELECT ${ALERT_COLUMNS} FROM alerts WHERE incident_id = $1 AND ends_at IS NULL`, [incident.id]);
      firingAlerts = open.length;
      if (open.length === 0) {
        await sequelize.query(
          `UPDATE incidents SET resolved_at = (SELECT COALESCE(max(ends_at), $2) FROM alerts WHERE incident_id = $1), resolved_by = 'alerts resolved', updated_at = now() WHERE id = $1`,
          { bind: [incident.id, now], transaction },
        );
        status = "resolved";
      } else {
        const analysis = await analyse({ environmentId: environment.id, rows: open, ctx });
        const ranking = storedRanking(analysis, ctx);
        await sequelize.query(
          `UPDATE incidents SET ranking = $2::jsonb,
                  peak_ranking = CASE WHEN $3 >= peak_firing THEN $2::jsonb ELSE peak_ranking END,
                  peak_firing = GREATEST(peak_firing, $3), updated_at = now()
            WHERE id = $1`,
          { bind: [incident.id, JSON.stringify(ranking), analysis.result.firing.length], transaction },
        );
      }
    } else if (incident) {
      firingAlerts = await countFiring(incident.id, transaction);
    }

    // Unknown components of this request, listed in the response (and on the screen), never dropped.
    const thisRequest = parsed.alerts.map((a) => resolveAlert(a, ctx.settings.alertLabels, ctx.index));
    const unknown = unknownGroups(thisRequest.map((res) => ({ component: res.key, named: res.named }) as IncidentAlert));
    const response: ReceiveAlertsResponse = {
      format: parsed.format,
      received: parsed.alerts.length,
      ...counts,
      truncated: parsed.truncated,
      unknown,
      incident: incident && status ? { number: incident.number, status, firingAlerts, url: `/environments/${environment.slug}/incidents/${incident.number}` } : null,
    };
    await recordAudit(
      {
        actor,
        action: "alerts.receive",
        targetType: "incident",
        targetId: incident ? `${environment.slug}#${incident.number}` : environment.slug,
        environmentId: environment.id,
        after: { ...response, openedIncident, snapshot: ctx.snapshot?.number ?? null },
      },
      transaction,
    );
    return response;
  });
}

// ---------------------------------------------------------------------------------------------
// Reads.

export async function getCurrentIncident({ slug, link }: { slug: string; link: string }): Promise<CurrentIncidentResponse> {
  const environment = await getEnvironmentOrThrow({ slug });
  const { sequelize } = db();
  const [row] = await sequelize.query<IncidentDbRow>(`${INCIDENT_SELECT} WHERE i.environment_id = :id AND i.resolved_at IS NULL`, { type: QueryTypes.SELECT, replacements: { id: environment.id } });
  const ctx = await readContext({ environmentId: environment.id });
  const rows = row
    ? await sequelize.query<AlertRow>(`SELECT ${ALERT_COLUMNS} FROM alerts WHERE incident_id = :id ORDER BY starts_at, fingerprint`, { type: QueryTypes.SELECT, replacements: { id: row.id } })
    : [];
  const firingRows = rows.filter((r) => r.ends_at === null);
  const analysis = await analyse({ environmentId: environment.id, rows: firingRows, ctx });
  const now = new Date();
  const incident = row ? toIncidentRow(row, "latest") : null;
  return {
    environment: environment.slug,
    incident,
    snapshot: ctx.snapshot ? { number: ctx.snapshot.number, createdAt: ctx.snapshot.createdAt, ageSeconds: Math.round((now.getTime() - Date.parse(ctx.snapshot.createdAt)) / 1000) } : null,
    firingAlerts: analysis.alerts,
    resolvedAlerts: rows
      .filter((r) => r.ends_at !== null)
      .sort((a, b) => b.ends_at!.getTime() - a.ends_at!.getTime())
      .slice(0, 50)
      .map((r) => toAlert(r, ctx)),
    result: capPredicted(analysis.result),
    predictedTotal: { down: analysis.result.predicted.down.length, degraded: analysis.result.predicted.degraded.length },
    unknownAlerts: analysis.unknownAlerts,
    page: analysis.page,
    summary: incidentSummaryText({
      env: environment.slug,
      incident: incident ? { number: incident.number, openedAt: incident.openedAt } : null,
      alertCount: analysis.alerts.length,
      result: analysis.result,
      page: analysis.page,
      unknownAlerts: analysis.unknownAlerts,
      snapshot: ctx.snapshot,
      now,
      link,
    }),
    caution: INCIDENT_CAUTION,
    computedAt: now.toISOString(),
  };
}

/** Predicted failures are listed most critical first, so the cut keeps what a responder reads first. */
function capPredicted(r: OriginResult): OriginResult {
  const cut = (p: { down: string[]; degraded: string[] }) => ({ down: p.down.slice(0, PREDICTED_LIST_CAP), degraded: p.degraded.slice(0, PREDICTED_LIST_CAP) });
  return { ...r, predicted: cut(r.predicted), origins: r.origins.map((o) => ({ ...o, predicted: cut(o.predicted) })) };
}

export async function getIncident({ slug, number }: { slug: string; number: number }): Promise<IncidentDetailResponse> {
  const environment = await getEnvironmentOrThrow({ slug });
  const { sequelize } = db();
  const [row] = await sequelize.query<IncidentDbRow>(`${INCIDENT_SELECT} WHERE i.environment_id = :id AND i.number = :number`, {
    type: QueryTypes.SELECT,
    replacements: { id: environment.id, number },
  });
  if (!row) throw notFound(`Incident #${number}`);
  const ctx = await readContext({ environmentId: environment.id });
  const rows = await sequelize.query<AlertRow>(`SELECT ${ALERT_COLUMNS} FROM alerts WHERE incident_id = :id ORDER BY starts_at, fingerprint`, { type: QueryTypes.SELECT, replacements: { id: row.id } });
  return { environment: environment.slug, incident: toIncidentRow(row, "peak"), alerts: rows.map((r) => toAlert(r, ctx)), caution: INCIDENT_CAUTION };
}

const INCIDENT_SORTS: Record<IncidentsQuery["sort"], string> = { number: "i.number", peakFiring: "i.peak_firing", alertCount: "alert_count" };

export async function listIncidents({ slug, query }: { slug: string; query: IncidentsQuery }): Promise<IncidentHistoryResponse & { limit: number; offset: number }> {
  const environment = await getEnvironmentOrThrow({ slug });
  const { sequelize } = db();
  const { limit, offset } = query;
  const status = query.status === "open" ? " AND i.resolved_at IS NULL" : query.status === "resolved" ? " AND i.resolved_at IS NOT NULL" : "";
  const rows = await sequelize.query<IncidentDbRow & { total: string }>(
    `${INCIDENT_SELECT.replace("FROM incidents i", ", count(*) OVER () AS total FROM incidents i")} WHERE i.environment_id = :id${status}
      ORDER BY ${orderSql(INCIDENT_SORTS[query.sort], orderOf(INCIDENT_LIST, query), "i.number DESC")} LIMIT :limit OFFSET :offset`,
    { type: QueryTypes.SELECT, replacements: { id: environment.id, limit, offset } },
  );
  // What actually caused incidents (the first probable origin at each incident's peak), over the
  // whole history, beside what the measures predict (the top of the stored ranking).
  const causes = await sequelize.query<{ key: string; incidents: string; last_at: Date }>(
    `SELECT COALESCE(peak_ranking, ranking)->'origins'->0->>'key' AS key, count(*) AS incidents, max(opened_at) AS last_at
       FROM incidents WHERE environment_id = :id AND COALESCE(peak_ranking, ranking)->'origins'->0->>'key' IS NOT NULL
      GROUP BY 1 ORDER BY count(*) DESC, max(opened_at) DESC LIMIT 20`,
    { type: QueryTypes.SELECT, replacements: { id: environment.id } },
  );
  const ranks = await sequelize.query<{ key: string; rank: number; pinch_score: number }>(
    `WITH served AS (
       SELECT s.id FROM snapshots s JOIN analysis_runs a ON a.snapshot_id = s.id
        WHERE s.environment_id = :id AND a.status = 'done' ORDER BY s.number DESC LIMIT 1)
     SELECT m.key, m.rank, m.pinch_score FROM component_metrics m JOIN served ON m.snapshot_id = served.id
      WHERE m.rank <= 10 OR m.key IN (:keys) ORDER BY m.rank`,
    { type: QueryTypes.SELECT, replacements: { id: environment.id, keys: causes.length ? causes.map((c) => c.key) : [""] } },
  );
  const byKey = new Map(ranks.map((r) => [r.key, r]));
  const causeCount = new Map(causes.map((c) => [c.key, Number(c.incidents)]));
  return {
    environment: environment.slug,
    items: rows.map((r) => toIncidentRow(r, "peak")),
    total: Number(rows[0]?.total ?? 0),
    limit,
    offset,
    causes: causes.map((c) => ({ key: c.key, incidents: Number(c.incidents), lastAt: c.last_at.toISOString(), pinchRank: byKey.get(c.key)?.rank ?? null, pinchScore: byKey.get(c.key)?.pinch_score ?? null })),
    predicted: ranks.filter((r) => r.rank <= 10).map((r) => ({ key: r.key, pinchRank: r.rank, pinchScore: r.pinch_score, incidents: causeCount.get(r.key) ?? 0 })),
  };
}

/** Close an incident by hand (an alert source that never sends resolved): its firing alerts end now. */
export async function resolveIncident({ slug, number, actor, reason }: { slug: string; number: number; actor: Actor; reason: string }): Promise<IncidentRow> {
  const environment = await getEnvironmentOrThrow({ slug });
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-alerts:' || $1))", { bind: [environment.id], transaction });
    const [row] = await sequelize.query<{ id: string; resolved_at: Date | null }>("SELECT id, resolved_at FROM incidents WHERE environment_id = $1 AND number = $2 FOR UPDATE", {
      type: QueryTypes.SELECT,
      bind: [environment.id, number],
      transaction,
    });
    if (!row) throw notFound(`Incident #${number}`);
    if (row.resolved_at) throw new AppError("conflict", `Incident #${number} is resolved already`);
    const n = await countFiring(row.id, transaction);
    await sequelize.query("UPDATE alerts SET ends_at = GREATEST(starts_at, now()) WHERE incident_id = $1 AND ends_at IS NULL", { bind: [row.id], transaction });
    const resolvedBy = `${actor.label}: ${reason}`.slice(0, 200);
    await sequelize.query("UPDATE incidents SET resolved_at = now(), resolved_by = $2, updated_at = now() WHERE id = $1", { bind: [row.id, resolvedBy], transaction });
    await recordAudit({ actor, action: "incident.resolve", targetType: "incident", targetId: `${environment.slug}#${number}`, environmentId: environment.id, before: { firingAlerts: n }, after: { reason } }, transaction);
    const [updated] = await sequelize.query<IncidentDbRow>(`${INCIDENT_SELECT} WHERE i.id = :id`, { type: QueryTypes.SELECT, replacements: { id: row.id }, transaction });
    return toIncidentRow(updated!, "peak");
  });
}
