// JSON requests from the admin screens, keeping the whole error body (issues included) so a form
// can put each problem beside its field.
import { dateTime } from "@/components/ui/format";

export interface RequestProblem {
  status: number;
  error: string;
  message: string;
  issues: { path: string; message: string }[];
}

export type RequestResult<T> = { ok: true; data: T } | { ok: false; problem: RequestProblem };

export async function sendJson<T>(url: string, method: string, body?: unknown): Promise<RequestResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers: { accept: "application/json", ...(body === undefined ? {} : { "content-type": "application/json" }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, problem: { status: 0, error: "network", message: "Could not reach Pinchpoint. Check the connection and try again.", issues: [] } };
  }
  const json: unknown = await res.json().catch(() => null);
  if (res.ok) return { ok: true, data: json as T };
  const err = (json ?? {}) as Partial<RequestProblem>;
  return {
    ok: false,
    problem: { status: res.status, error: err.error ?? "http_error", message: err.message ?? `Request failed (${res.status})`, issues: Array.isArray(err.issues) ? err.issues : [] },
  };
}

export function formatWhen(iso: string | null): string {
  if (!iso) return "—";
  return dateTime(iso);
}
