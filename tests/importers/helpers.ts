import { readFileSync } from "node:fs";
import { expect } from "vitest";
import type { ImportResult, InventoryIssue, NormalisedInventory } from "@/lib/inventory/types";

export function fixture(path: string): Buffer {
  return readFileSync(new URL(`../fixtures/${path}`, import.meta.url));
}

export function expectOk(r: ImportResult): NormalisedInventory {
  if (!r.ok) throw new Error(`expected success, got ${r.status}: ${JSON.stringify(r.issues, null, 1)}`);
  return r.inventory;
}

export function expectIssues(r: ImportResult, status: 413 | 422): InventoryIssue[] {
  if (r.ok) throw new Error("expected the import to fail");
  expect(r.status).toBe(status);
  return r.issues;
}

/** One located issue: exact path, line and column, message matched loosely. */
export function located(path: string, line: number, column: number, message: RegExp): unknown {
  return expect.objectContaining({ path, line, column, message: expect.stringMatching(message) });
}
