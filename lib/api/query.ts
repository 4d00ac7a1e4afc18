// Request parsing for route handlers: zod over query strings, params and JSON bodies.
import type { z } from "zod";
import { AppError, parseOrThrow } from "@/lib/errors";
import { readBodyWithLimit } from "./body";

export function parseQuery<T extends z.ZodType>(url: string | URL, schema: T): z.infer<T> {
  const value: Record<string, string> = {};
  for (const [k, v] of new URL(url).searchParams) value[k] = v;
  return parseOrThrow(schema, value, "query");
}

/** Path parameters come from the URL, so a bad one is a 404 rather than a validation error. */
export function parseParams<T extends z.ZodType>(params: unknown, schema: T): z.infer<T> {
  const result = schema.safeParse(params);
  if (!result.success) throw new AppError("not_found", "No such resource: the path has an invalid name in it");
  return result.data;
}

/** JSON bodies of the API are small; inventories have their own, larger limit (lib/api/body.ts). */
export const MAX_JSON_BODY_BYTES = 1024 * 1024;

/** Parse a JSON request body, refusing one over 1 MiB; a body that is not JSON is a 400, not a 500. */
export async function readJson(req: Request): Promise<unknown> {
  const bytes = await readBodyWithLimit(req, MAX_JSON_BODY_BYTES);
  try {
    return JSON.parse(bytes.toString("utf8"));
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON");
  }
}
