// OpenTelemetry traces as a file: OTLP/JSON (one ExportTraceServiceRequest) or JSON Lines (one
// request a line, as the Collector's file exporter writes). The spans are folded into observed
// edges (lib/traces/fold.ts: the semantic-conventions rules) and never kept. This is the pure import
// API; the push path (lib/data/traces.ts) streams files through the same steps into aggregates.
import type { ImportResult, InventoryIssue, ObservedEdge } from "@/lib/inventory/types";
import { TraceFold, type FoldStats } from "@/lib/traces/fold";
import { describeRejects, noRejects, type RejectedSpans } from "@/lib/traces/types";
import { checkOrigin } from "../shared/origin";
import { loadStructured } from "../shared/structured";
import { finishIssues, type PathSegment } from "../shared/text";
import { parsePath } from "@/lib/issue-path";
import { TraceFileError, traceDocumentsOfText, type TraceDocument } from "./documents";
import { spansFromJson } from "./spans";

export { normaliseKey } from "@/lib/traces/semconv";

export interface OtlpOptions {
  body: string | Uint8Array;
  source?: string;
  environment?: string;
}

/**
 * Fold one document of a file. Issues are located by line when the file has several documents.
 * Throws TraceFileError on data that does not decode (nothing of the file is kept then).
 */
export function foldTraceDocument(fold: TraceFold, doc: TraceDocument, rejected: RejectedSpans, { lines }: { lines: boolean }): void {
  const decoded = spansFromJson(doc.value, { file: true });
  if (!decoded.ok) throw new TraceFileError(422, locate(doc, decoded.issues, lines));
  for (const [reason, n] of decoded.rejected.reasons) rejected.reasons.set(reason, (rejected.reasons.get(reason) ?? 0) + n);
  rejected.count += decoded.rejected.count;
  fold.add(decoded.spans);
}

/** Issues of one document with the line and column they point at (found only when something failed). */
function locate(doc: TraceDocument, issues: InventoryIssue[], lines: boolean): InventoryIssue[] {
  const loaded = loadStructured(doc.text, { json: true });
  return issues.map((i) => {
    const segments: PathSegment[] = i.path === "(root)" ? [] : (parsePath(i.path) ?? []);
    const at = loaded.ok ? loaded.source.locate(segments) : {};
    const line = at.line !== undefined ? at.line + doc.line - 1 : lines ? doc.line : undefined;
    return { path: lines ? `lines[${doc.line}].${i.path}` : i.path, ...(line !== undefined ? { line } : {}), ...(at.column !== undefined ? { column: at.column } : {}), message: i.message };
  });
}

/** What a folded file did not use, as push warnings. */
export function foldWarnings(stats: FoldStats, rejected: RejectedSpans): InventoryIssue[] {
  const out: InventoryIssue[] = [];
  if (rejected.count > 0) out.push({ path: "resourceSpans", message: `skipped: ${describeRejects(rejected)}` });
  if (stats.duplicates > 0) out.push({ path: "resourceSpans", message: `${stats.duplicates} spans repeated a trace and span id already read; each span counts once` });
  if (stats.unnamed > 0) out.push({ path: "resourceSpans", message: `${stats.unnamed} spans have a service.name that gives no usable component key; they were skipped` });
  if (stats.unresolved > 0) out.push({ path: "resourceSpans", message: `${stats.unresolved} client, producer or consumer spans name no callee (no SERVER child, peer.service, server.address, rpc.service, database or messaging destination)` });
  if (stats.orphans > 0) out.push({ path: "resourceSpans", message: `${stats.orphans} server spans have a parent span not in this file; no edge taken from them` });
  return out;
}

export function parseOtlp(opts: Omit<OtlpOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const fold = new TraceFold();
  const rejected = noRejects();
  try {
    const docs = traceDocumentsOfText(opts.text);
    for (const doc of docs) foldTraceDocument(fold, doc, rejected, { lines: docs.length > 1 });
  } catch (error) {
    if (!(error instanceof TraceFileError)) throw error;
    return { ok: false, status: error.status, issues: finishIssues([...origin.issues, ...error.issues]) };
  }
  if (origin.source === null) return { ok: false, status: 422, issues: finishIssues(origin.issues) };
  fold.finish();
  const cmp = (x: string, y: string): number => (x < y ? -1 : x > y ? 1 : 0);
  const observedEdges: ObservedEdge[] = [...fold.edges.values()]
    .map((e) => ({ from: e.from, to: e.to, count: e.calls, evidence: [...e.evidence].sort(cmp).join(",") }))
    .sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to));
  return {
    ok: true,
    inventory: { source: origin.source, environment: origin.environment, components: [], observedEdges, warnings: foldWarnings(fold.stats, rejected) },
  };
}
