import { MAX_BODY_BYTES } from "@/lib/inventory/limits";
import type { InventoryIssue } from "@/lib/inventory/types";
import { byteLength, decodeBody } from "./text";

export type CheckedText = { ok: true; text: string } | { ok: false; status: 413 | 422; issues: InventoryIssue[] };

/** Size limit first (before any decoding work), then UTF-8 and binary checks. */
export function checkedText(body: string | Uint8Array): CheckedText {
  const size = byteLength(body);
  if (size > MAX_BODY_BYTES) {
    return {
      ok: false,
      status: 413,
      issues: [{ path: "", message: `the body is ${size} bytes; at most ${MAX_BODY_BYTES} (20 MiB) are accepted` }],
    };
  }
  const decoded = decodeBody(body);
  return decoded.ok ? decoded : { ok: false, status: 422, issues: decoded.issues };
}
