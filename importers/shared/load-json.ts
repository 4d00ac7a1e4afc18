// JSON: JSON.parse does the parsing; positions come from `yaml` (JSON is YAML 1.2) only when asked.
import { scanJson } from "./json-syntax";
import { type CountLimit, isRecord, type Loaded, tooMany } from "./source";
import { formatPath, lineIndex } from "./text";
import { lazyLocate } from "./yaml-locator";

// JSON.parse does the work; the YAML parser (JSON is YAML 1.2) is only run when an issue
// needs a position, which keeps a clean 20 MiB push fast.
export function loadJson(text: string, limit: CountLimit | undefined): Loaded {
  const toPos = lineIndex(text);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (err) {
    const found = scanJson(text).error;
    const at = found ? toPos(found.offset) : {};
    // No grammar error found means JSON.parse gave up for another reason, in practice depth.
    const message = found ? found.message : err instanceof RangeError ? "the document is nested too deeply" : "the text is not JSON";
    return { ok: false, status: 422, issues: [{ path: "", ...at, message: `invalid JSON: ${message}` }] };
  }
  const dupes = scanJson(text).duplicates;
  if (dupes.length > 0) {
    return {
      ok: false,
      status: 422,
      issues: dupes.map((d) => ({
        path: formatPath(d.path),
        ...toPos(d.offset),
        message: `duplicate member name ${JSON.stringify(d.key)} in one object`,
      })),
    };
  }
  const locate = lazyLocate(text);
  if (limit !== undefined && isRecord(value)) {
    const coll = value[limit.key];
    const size = Array.isArray(coll) ? coll.length : isRecord(coll) ? Object.keys(coll).length : 0;
    if (size > limit.max) {
      // Pointing at the member name is enough here, and spares a YAML parse of a file that is refused anyway.
      const at = text.indexOf(JSON.stringify(limit.key));
      return { ok: false, status: 413, issues: [tooMany(limit, size, at < 0 ? {} : toPos(at))] };
    }
  }
  return { ok: true, source: { value, warnings: [], locate } };
}
