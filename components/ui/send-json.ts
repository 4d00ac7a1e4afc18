// Writes from forms: JSON to our API, and an error message that names each located issue
// (fetchJson keeps only the top-level message, which for a 422 is just "Invalid body").
export interface SendResult<T> {
  ok: boolean;
  status: number;
  data: T | null;
  message: string | null;
}

export async function sendJson<T>(url: string, method: "POST" | "PUT" | "PATCH" | "DELETE", body?: unknown): Promise<SendResult<T>> {
  const res = await fetch(url, {
    method,
    headers: { accept: "application/json", ...(body === undefined ? {} : { "content-type": "application/json" }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const json: unknown = await res.json().catch(() => null);
  if (res.ok) return { ok: true, status: res.status, data: json as T, message: null };
  const err = (json ?? {}) as { message?: string; issues?: Array<{ path?: string; message?: string }> };
  const issues = (err.issues ?? []).map((i) => (i.path && i.path !== "(root)" ? `${i.path}: ${i.message ?? ""}` : (i.message ?? ""))).filter(Boolean);
  const message = issues.length ? issues.join("; ") : (err.message ?? `Request failed (${res.status})`);
  return { ok: false, status: res.status, data: null, message };
}
