// One error type, one code→status map, one place that renders errors (DESIGN §4 error shape).
import { NextResponse } from "next/server";
import type { z } from "zod";
import type { InventoryIssue } from "./inventory/types";
import { formatPath } from "./issue-path";

const ERROR_STATUS = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  /** A real push that a change policy at `block` refuses (lib/data/impact.ts). */
  policy_blocked: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  invalid_inventory: 422,
  invalid_request: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;
export type ErrorCode = keyof typeof ERROR_STATUS;

export interface ErrorBody {
  error: ErrorCode;
  message: string;
  issues?: InventoryIssue[];
}

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly issues?: InventoryIssue[];
  /** sent as Retry-After: the caller (CI, a load balancer) may simply try again after this long */
  readonly retryAfterSeconds?: number;

  constructor(code: ErrorCode, message: string, issues?: InventoryIssue[], options: { retryAfterSeconds?: number } = {}) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.issues = issues;
    this.retryAfterSeconds = options.retryAfterSeconds;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }

  toBody(): ErrorBody {
    return { error: this.code, message: this.message, ...(this.issues ? { issues: this.issues } : {}) };
  }
}

export const notFound = (what: string) => new AppError("not_found", `${what} not found`);
export const forbidden = (message = "Your role does not allow this") => new AppError("forbidden", message);
export const unauthorized = () => new AppError("unauthorized", "Sign in or send an API token (Authorization: Bearer ppt_…)");

/** zod issues → our located issues (path like `body.scopes[0]`). */
export function zodIssues(error: z.ZodError, prefix = ""): InventoryIssue[] {
  return error.issues.map((issue) => ({
    path: formatPath(issue.path, prefix) || "(root)",
    message: issue.message,
  }));
}

/** Parse with a zod schema or throw a 422 that names every problem. */
export function parseOrThrow<T extends z.ZodType>(schema: T, value: unknown, what: string): z.infer<T> {
  const result = schema.safeParse(value);
  if (!result.success) {
    throw new AppError("invalid_request", `Invalid ${what}`, zodIssues(result.error, what === "query" ? "query" : ""));
  }
  return result.data;
}

/** Seconds a client should wait before trying again while the database is unreachable. */
export const DATABASE_RETRY_AFTER_S = 5;

// Sequelize's connection failures, by name so that this module needs no database package, and
// PostgreSQL's own (SQLSTATE class 08 connection exception, 57P01–57P03 shutting down or not
// accepting connections, 53300 too many connections; PostgreSQL manual, Appendix A).
const CONNECTION_ERROR_NAMES = new Set([
  "SequelizeConnectionError",
  "SequelizeConnectionRefusedError",
  "SequelizeConnectionTimedOutError",
  "SequelizeConnectionAcquireTimeoutError",
  "SequelizeHostNotFoundError",
  "SequelizeHostNotReachableError",
  "SequelizeInvalidConnectionError",
  "SequelizeAccessDeniedError",
]);
const UNAVAILABLE_SQLSTATE = /^(08|57P0[123]$|53300$)/;
const UNAVAILABLE_MESSAGE = /Connection terminated|connection error and is not queryable|ECONNREFUSED|ECONNRESET|EHOSTUNREACH|timeout exceeded when trying to connect/i;

/** Did this fail because PostgreSQL could not be reached (rather than because of what was asked)? */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 4; depth++) {
    const { name, message, code } = e as { name?: unknown; message?: unknown; code?: unknown };
    if (typeof name === "string" && CONNECTION_ERROR_NAMES.has(name)) return true;
    if (typeof code === "string" && UNAVAILABLE_SQLSTATE.test(code)) return true;
    if (typeof message === "string" && UNAVAILABLE_MESSAGE.test(message)) return true;
    e = (e as { parent?: unknown; original?: unknown; cause?: unknown }).parent ?? (e as { original?: unknown }).original ?? (e as { cause?: unknown }).cause;
  }
  return false;
}

export const databaseUnavailable = () =>
  new AppError("unavailable", "Pinchpoint cannot reach its database right now. Try again in a few seconds (a push can simply be sent again: identical content makes no new snapshot).", undefined, {
    retryAfterSeconds: DATABASE_RETRY_AFTER_S,
  });

/** Render any thrown value as the API's error JSON; unknown errors are logged and never leak internals. */
export function errorResponse(error: unknown): NextResponse<ErrorBody> {
  if (!(error instanceof AppError) && isDatabaseUnavailable(error)) {
    console.error("[api] database unreachable:", error instanceof Error ? error.message : error);
    error = databaseUnavailable();
  }
  if (error instanceof AppError) {
    const headers = error.retryAfterSeconds !== undefined ? { "retry-after": String(error.retryAfterSeconds) } : undefined;
    return NextResponse.json(error.toBody(), { status: error.status, headers });
  }
  console.error("[api] unexpected error:", error);
  return NextResponse.json({ error: "internal", message: "Something went wrong on our side; it has been logged" } as const, {
    status: 500,
  });
}
