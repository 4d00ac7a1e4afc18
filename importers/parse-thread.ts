// The body of a parse worker thread (importers/off-thread.ts): the same pure entry point as
// everywhere else, run where a slow file cannot hold up the server's event loop.
import type { ImportRequest, ImportResult } from "@/lib/inventory/types";
import { importInventory } from "./index";

export default function parseInThread(req: ImportRequest): ImportResult {
  return importInventory(req);
}
