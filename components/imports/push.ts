// The push request from the browser (session cookie), with every answer of DESIGN §4 turned
// into one value the screen can render. Its body is a file, not JSON, so it goes through
// lib/client/api.ts's fetchJson (not sendJson), parsed with the route's response schema.
import { pushResultSchema, type PushResult } from "@/lib/api/schemas/inventory";
import { ApiError, fetchJson } from "@/lib/client/api";
import type { ImportFormat, InventoryIssue } from "@/lib/inventory/types";
import { contentTypeFor } from "./detect";

export type PushOutcome =
  | { kind: "ok"; result: PushResult }
  | { kind: "invalid"; status: number; message: string; issues: InventoryIssue[] }
  | { kind: "conflict"; message: string; issues: InventoryIssue[] }
  | { kind: "too-large"; message: string; issues: InventoryIssue[] }
  | { kind: "blocked"; message: string; issues: InventoryIssue[] }
  | { kind: "refused"; status: number; message: string };

/**
 * One file as the body, or — for a layered Compose project — several files as a multipart body, in
 * the order given (base first, then overrides; `.env` files anywhere).
 */
export async function pushFile({
  env,
  format,
  source,
  text,
  files,
  profiles,
  dryRun,
  overrideReason,
}: {
  env: string;
  format: ImportFormat;
  source: string;
  text: string;
  files?: { name: string; text: string }[];
  profiles?: string;
  dryRun: boolean;
  /** Why an architect or admin pushes past a blocking change policy. */
  overrideReason?: string | null;
}): Promise<PushOutcome> {
  const query = new URLSearchParams();
  if (dryRun) query.set("dry_run", "true");
  // Every preview shows the impact on the failure points before "Push".
  if (dryRun) query.set("impact", "true");
  if (overrideReason) query.set("override_reason", overrideReason);
  query.set("format", format);
  if (source) query.set("source", source);
  if (format === "compose" && profiles) query.set("profiles", profiles);
  let payload: BodyInit = text;
  const headers: Record<string, string> = {};
  if (files && files.length > 1) {
    const form = new FormData();
    for (const f of files) form.append("file", new Blob([f.text]), f.name);
    // fetch sets the multipart content type with its boundary itself.
    payload = form;
  } else headers["content-type"] = contentTypeFor(format, text);
  try {
    const result = await fetchJson(pushResultSchema, `/api/v1/environments/${encodeURIComponent(env)}/inventory?${query}`, { method: "POST", headers, body: payload });
    return { kind: "ok", result };
  } catch (e) {
    // fetchJson turns every failure (offline included) into an ApiError.
    if (!(e instanceof ApiError)) throw e;
    const { status, message, issues } = e;
    if (status === 409 && e.code === "policy_blocked") return { kind: "blocked", message, issues };
    if (status === 409) return { kind: "conflict", message, issues };
    if (status === 413) return { kind: "too-large", message, issues };
    if (status === 422) return { kind: "invalid", status, message, issues };
    return { kind: "refused", status, message };
  }
}
