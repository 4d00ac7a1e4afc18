// One error type, one code→status map, one place that renders errors (DESIGN §4 error shape).
import { NextResponse } from "next/server";
import type { z } from "zod";
import type { InventoryIssue } from "./inventory/types";

export const ERROR_STATUS = {
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

  constructor(code: ErrorCode, message: string, issues?: InventoryIssue[]) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.issues = issues;
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
    path: formatPath(prefix, issue.path),
    message: issue.message,
  }));
}

export function formatPath(prefix: string, path: readonly PropertyKey[]): string {
  let out = prefix;
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out ? `.${String(part)}` : String(part);
  }
  return out || "(root)";
}

/** Parse with a zod schema or throw a 422 that names every problem. */
export function parseOrThrow<T extends z.ZodType>(schema: T, value: unknown, what: string): z.infer<T> {
  const result = schema.safeParse(value);
  if (!result.success) {
    throw new AppError("invalid_request", `Invalid ${what}`, zodIssues(result.error, what === "query" ? "query" : ""));
  }
  return result.data;
}

/** Render any thrown value as the API's error JSON; unknown errors are logged and never leak internals. */
export function errorResponse(error: unknown): NextResponse<ErrorBody> {
  if (error instanceof AppError) {
    return NextResponse.json(error.toBody(), { status: error.status });
  }
  console.error("[api] unexpected error:", error);
  return NextResponse.json({ error: "internal", message: "Something went wrong on our side; it has been logged" } as const, {
    status: 500,
  });
}
