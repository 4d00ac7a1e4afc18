// Guess an upload's format from its name and first bytes, so the common case needs no choice;
// the user can always override. Pure, so the guess is testable without a browser.
import { SOURCE_PATTERN, type ImportFormat } from "@/lib/inventory/types";

export const FORMATS: { value: ImportFormat; label: string; hint: string }[] = [
  { value: "pinchpoint", label: "Pinchpoint inventory", hint: "YAML or JSON, format 1 — names its own source" },
  { value: "compose", label: "Compose project", hint: "one file, or several at once (base, overrides, .env): merged as Compose does" },
  { value: "csv", label: "CSV edge list", hint: "header from,to[,strength,kind,tier,team,via,any_of]; comma, semicolon or tab" },
  { value: "otlp", label: "OpenTelemetry traces", hint: "OTLP/JSON or JSON Lines (the Collector's file exporter); gives observed needs only" },
  { value: "kubernetes", label: "Kubernetes manifests", hint: "YAML documents, JSON or a List: workloads, Services, Ingresses and routes" },
];

export interface Detection {
  format: ImportFormat;
  why: string;
}

const head = (text: string) => text.replace(/^\uFEFF/, "").slice(0, 64 * 1024);

export function detectFormat(fileName: string, text: string): Detection {
  const name = fileName.toLowerCase();
  const start = head(text);
  const trimmed = start.trimStart();
  if (name.endsWith(".csv") || name.endsWith(".tsv") || /^(from|source|caller|consumer)\s*[,;\t]\s*(to|target|callee|provider|dependency)\b/i.test(trimmed)) {
    return { format: "csv", why: "a CSV file with a from,to header" };
  }
  if (trimmed.startsWith("{") || trimmed.startsWith("[")) {
    if (/"resourceSpans"\s*:/.test(start)) return { format: "otlp", why: "JSON with resourceSpans (an OTLP trace export)" };
    if (/"apiVersion"\s*:/.test(start) && /"kind"\s*:/.test(start)) return { format: "kubernetes", why: "JSON objects with apiVersion and kind" };
    if (/"services"\s*:/.test(start) && !/"pinchpoint"\s*:/.test(start)) return { format: "compose", why: "JSON with services and no pinchpoint version" };
    return { format: "pinchpoint", why: "JSON" };
  }
  if (/^pinchpoint\s*:/m.test(start)) return { format: "pinchpoint", why: "a pinchpoint: version line" };
  // Top-level apiVersion and kind: a Kubernetes manifest (Compose and format 1 files have neither).
  if (/^apiVersion\s*:/m.test(start) && /^kind\s*:/m.test(start)) return { format: "kubernetes", why: "apiVersion and kind at the top level of a document" };
  if (/(^|\/)(docker-)?compose[^/]*\.ya?ml$/.test(name) || /^services\s*:/m.test(start)) return { format: "compose", why: "a Compose services: section" };
  return { format: "pinchpoint", why: "no other format matched" };
}

export function contentTypeFor(format: ImportFormat, text: string): string {
  if (format === "csv") return "text/csv";
  if (format === "otlp") return "application/json";
  const trimmed = head(text).trimStart();
  return trimmed.startsWith("{") || trimmed.startsWith("[") ? "application/json" : "application/yaml";
}

/** A source name suggested from the file name, shaped to the source pattern. */
export function suggestSource(fileName: string): string {
  const base = fileName.toLowerCase().replace(/\.[a-z0-9]+$/, "").replace(/[^a-z0-9._-]+/g, "-").replace(/^[^a-z0-9]+/, "").slice(0, 60);
  return base || "upload";
}

/** The source a Compose file names for itself (`x-pinchpoint: { source: … }` at the top level), if any. */
export function sourceNamedIn(text: string): string | null {
  const block = /^x-pinchpoint:[ \t]*(\{[^}\n]*\}|\n(?:[ \t]+.*\n?|[ \t]*\n)*)/m.exec(head(text));
  const m = block ? /(?:^|[\s{,])source:[ \t]*["']?([^"'\s,}]+)["']?/m.exec(block[1] ?? "") : null;
  return m?.[1] && SOURCE_PATTERN.test(m[1]) ? m[1] : null;
}
