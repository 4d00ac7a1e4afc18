// `source` and `environment` given by the push, for formats whose files do not name them.
import { EnvironmentSlugSchema, SourceSchema } from "@/lib/inventory/schema";
import type { InventoryIssue } from "@/lib/inventory/types";

export interface Origin {
  source: string | null;
  environment: string | null;
  issues: InventoryIssue[];
}

export function checkOrigin(opts: { source?: string; environment?: string }): Origin {
  const issues: InventoryIssue[] = [];
  let source: string | null = null;
  if (opts.source === undefined || opts.source === "") {
    issues.push({ path: "source", message: "this format names no source: give one with ?source=…" });
  } else {
    const r = SourceSchema.safeParse(opts.source);
    if (r.success) source = r.data;
    else issues.push({ path: "source", message: r.error.issues[0]?.message ?? "invalid source" });
  }
  let environment: string | null = null;
  if (opts.environment !== undefined) {
    const r = EnvironmentSlugSchema.safeParse(opts.environment);
    if (r.success) environment = r.data;
    else issues.push({ path: "environment", message: r.error.issues[0]?.message ?? "invalid environment" });
  }
  return { source, environment, issues };
}
