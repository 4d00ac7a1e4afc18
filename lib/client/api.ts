// The browser's side of our API: one way to read (swr hooks parsing each answer with its
// response schema from lib/api/schemas) and one way to write (JSON from forms and buttons, with
// the whole error body kept so a form can put each located issue beside its field).
import useSWR, { type SWRConfiguration, type SWRResponse } from "swr";
import type { z } from "zod";

export interface ApiIssue {
  path: string;
  message: string;
  /** The file it is in, when a push carried several (a layered Compose project). */
  file?: string;
  line?: number;
  column?: number;
}

/** A refused or failed request: the API's error code and message, and its located issues. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly issues: ApiIssue[] = [],
  ) {
    super(message);
    this.name = "ApiError";
  }

  /** The message with each located issue ("name: give the team a name"), for a notice that is not beside a field. */
  get detail(): string {
    const located = this.issues.map((i) => (i.path && i.path !== "(root)" ? `${i.path}: ${i.message}` : i.message)).filter(Boolean);
    return located.length ? located.join("; ") : this.message;
  }
}

const OFFLINE = "Could not reach Pinchpoint. Check the connection and try again.";

async function errorOf(res: Response): Promise<ApiError> {
  const body = (await res.json().catch(() => null)) as { error?: unknown; message?: unknown; issues?: unknown } | null;
  const issues = Array.isArray(body?.issues) ? (body.issues as ApiIssue[]).filter((i) => typeof i?.message === "string") : [];
  return new ApiError(res.status, typeof body?.error === "string" ? body.error : "http_error", typeof body?.message === "string" ? body.message : `Request failed (${res.status})`, issues);
}

async function request(url: string, init?: RequestInit): Promise<Response> {
  try {
    return await fetch(url, { ...init, headers: { accept: "application/json", ...init?.headers } });
  } catch {
    throw new ApiError(0, "network", OFFLINE);
  }
}

/** GET (or any request) whose answer is parsed with its response schema; throws ApiError. */
export async function fetchJson<S extends z.ZodType>(schema: S, url: string, init?: RequestInit): Promise<z.output<S>> {
  const res = await request(url, init);
  if (!res.ok) throw await errorOf(res);
  const parsed = schema.safeParse(await res.json().catch(() => null));
  if (!parsed.success) {
    // A mismatch is our bug, not the user's: say which field, so it can be reported.
    const first = parsed.error.issues[0];
    throw new ApiError(res.status, "bad_response", `The server's answer did not have the expected shape${first ? ` (${first.path.join(".") || "(root)"}: ${first.message})` : ""}`);
  }
  return parsed.data;
}

/**
 * Read an API route with swr: the URL is the cache key (null to wait), the answer parsed with
 * the route's response schema (one schema per route, so a cached answer always has its shape).
 */
export function useApi<S extends z.ZodType>(schema: S, url: string | null, config?: SWRConfiguration<z.output<S>, ApiError>): SWRResponse<z.output<S>, ApiError> {
  return useSWR<z.output<S>, ApiError>(url, (u: string) => fetchJson(schema, u), config);
}

export type SendResult<T> = { ok: true; data: T } | { ok: false; error: ApiError };

/**
 * A write (POST, PUT, PATCH, DELETE) with a JSON body; the answer parsed with `schema`. Never
 * throws: the caller shows `error` (or hands it to the form, which puts its issues on the fields).
 */
export async function sendJson<S extends z.ZodType>(schema: S, url: string, method: "POST" | "PUT" | "PATCH" | "DELETE", body?: unknown): Promise<SendResult<z.output<S>>> {
  try {
    const data = await fetchJson(schema, url, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { ok: true, data };
  } catch (error) {
    return { ok: false, error: error instanceof ApiError ? error : new ApiError(0, "network", OFFLINE) };
  }
}
