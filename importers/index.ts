// One entry point for every inventory format. Pure: no database, no HTTP framework.
import type { ImportRequest, ImportResult } from "@/lib/inventory/types";
import { parseCompose } from "./compose";
import { parseCsv } from "./csv";
import { parseKubernetes } from "./kubernetes";
import { parseOtlp } from "./otlp";
import { parsePinchpoint } from "./pinchpoint/parse";
import { MAX_BODY_BYTES } from "@/lib/inventory/limits";
import { checkedText } from "./shared/body";
import { byteLength } from "./shared/text";

export function importInventory(req: ImportRequest): ImportResult {
  // Size first: a 413 must not cost a decode or a parse.
  // Several files are a Compose project; the Compose importer checks each file's bytes itself.
  const several = req.files !== undefined && req.files.length > 0;
  if (several) {
    const total = (req.files ?? []).reduce((n, f) => n + byteLength(f.body), 0);
    if (total > MAX_BODY_BYTES) return { ok: false, status: 413, issues: [{ path: "", message: `the files are ${total} bytes together; at most ${MAX_BODY_BYTES} (20 MiB) are accepted` }] };
  }
  const text = checkedText(several ? "" : req.body);
  if (!text.ok) return text;
  const opts = { text: text.text, contentType: req.contentType, source: req.source, environment: req.environment, positions: req.positions };
  switch (req.format) {
    case "pinchpoint":
      return parsePinchpoint(opts);
    case "compose":
      return parseCompose({ ...opts, files: req.files, profiles: req.profiles });
    case "csv":
      return parseCsv(opts);
    case "otlp":
      return parseOtlp(opts);
    case "kubernetes":
      return parseKubernetes({ ...opts, settings: req.kubernetes });
    default: {
      // Unreachable for typed callers; a route passing an unchecked query string lands here.
      const format: never = req.format;
      return { ok: false, status: 422, issues: [{ path: "format", message: `unsupported format ${JSON.stringify(format)}: expected pinchpoint, compose, csv, otlp or kubernetes` }] };
    }
  }
}

