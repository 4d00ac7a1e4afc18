// Request parsing for route handlers: zod over query strings, params and JSON bodies.
import type { z } from "zod";
import { AppError, parseOrThrow } from "@/lib/errors";
import { formatPath } from "@/lib/issue-path";
import { findForbiddenText } from "@/lib/forbidden-text";
import { readBodyWithLimit } from "./body";

export function parseQuery<T extends z.ZodType>(url: string | URL, schema: T): z.infer<T> {
  const value: Record<string, string> = {};
  for (const [k, v] of new URL(url).searchParams) value[k] = v;
  refuseForbiddenText(value, "query");
  return parseOrThrow(schema, value, "query");
}

/** Path parameters come from the URL, so a bad one is a 404 rather than a validation error. */
export function parseParams<T extends z.ZodType>(params: unknown, schema: T): z.infer<T> {
  const result = schema.safeParse(params);
  if (!result.success) throw new AppError("not_found", "No such resource: the path has an invalid name in it");
  return result.data;
}

/** JSON bodies of the API are small; inventories have their own, larger limit (lib/api/body.ts). */
const MAX_JSON_BODY_BYTES = 1024 * 1024;

/** `application/json`, with or without parameters (`; charset=utf-8`). */
function isJsonContentType(value: string | null): boolean {
  return value !== null && /^application\/json\s*(;|$)/i.test(value.trim());
}

/**
 * Parse a JSON request body, refusing one over 1 MiB; a body that is not JSON is a 400, not a 500.
 * The body must say it is JSON: a page on another site can send `text/plain` without asking the
 * browser's permission (no CORS preflight), but never `application/json`.
 */
export async function readJson(req: Request): Promise<unknown> {
  if (!isJsonContentType(req.headers.get("content-type"))) {
    throw new AppError("unsupported_media_type", `This route takes a JSON body sent as Content-Type: application/json (got ${req.headers.get("content-type") ?? "none"})`);
  }
  const bytes = await readBodyWithLimit(req, MAX_JSON_BODY_BYTES);
  let value: unknown;
  try {
    value = JSON.parse(bytes.toString("utf8"));
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON");
  }
  refuseForbiddenText(value, "body");
  return value;
}

/** NUL, other control characters and lone surrogates in any field: a 422 naming each (lib/forbidden-text.ts). */
function refuseForbiddenText(value: unknown, prefix: "body" | "query"): void {
  const problems = findForbiddenText(value);
  if (problems.length === 0) return;
  throw new AppError(
    "invalid_request",
    `Invalid ${prefix}: ${problems.length === 1 ? "a field holds" : "fields hold"} characters no text may contain`,
    problems.map((p) => ({ path: formatPath(p.path, prefix) || "(root)", message: p.message })),
  );
}
