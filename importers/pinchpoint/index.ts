// Pinchpoint format 1 importer (YAML or JSON).
import type { ImportResult } from "@/lib/inventory/types";
import { checkedText } from "../shared/body";
import { parsePinchpoint } from "./parse";

export { parsePinchpoint } from "./parse";

export function importPinchpoint(opts: {
  body: string | Uint8Array;
  contentType?: string;
  source?: string;
  environment?: string;
  positions?: boolean;
}): ImportResult {
  const text = checkedText(opts.body);
  if (!text.ok) return text;
  return parsePinchpoint({ ...opts, text: text.text });
}
