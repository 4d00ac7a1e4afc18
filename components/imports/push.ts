// The push request from the browser (session cookie), with every answer of DESIGN §4 turned
// into one value the screen can render. Its body is a file, not JSON, so it is sent here rather
// than through lib/client/api.ts; the answer is parsed with the same response schema.
import { pushResultSchema, type PushResult } from "@/lib/api/schemas/inventory";
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
  const headers: Record<string, string> = { accept: "application/json" };
  if (files && files.length > 1) {
    const form = new FormData();
    for (const f of files) form.append("file", new Blob([f.text]), f.name);
    // fetch sets the multipart content type with its boundary itself.
    payload = form;
  } else headers["content-type"] = contentTypeFor(format, text);
  let res: Response;
  try {
    res = await fetch(`/api/v1/environments/${encodeURIComponent(env)}/inventory?${query}`, { method: "POST", headers, body: payload });
  } catch {
    return { kind: "refused", status: 0, message: "Could not reach Pinchpoint. Check the connection and try again." };
  }
  const json: unknown = await res.json().catch(() => null);
  if (res.ok) {
    const parsed = pushResultSchema.safeParse(json);
    return parsed.success ? { kind: "ok", result: parsed.data } : { kind: "refused", status: res.status, message: "The server's answer did not have the expected shape" };
  }
  const body = json as { error?: string; message?: string; issues?: InventoryIssue[] } | null;
  const message = body?.message ?? `The server answered ${res.status}`;
  const issues = Array.isArray(body?.issues) ? body.issues : [];
  if (res.status === 409 && body?.error === "policy_blocked") return { kind: "blocked", message, issues };
  if (res.status === 409) return { kind: "conflict", message, issues };
  if (res.status === 413) return { kind: "too-large", message, issues };
  if (res.status === 422) return { kind: "invalid", status: res.status, message, issues };
  return { kind: "refused", status: res.status, message };
}
