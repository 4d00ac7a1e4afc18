// Format 1 snippets a team can paste into its own file: a need the traces showed ("declare this
// need"), or an alias that makes a trace name meet a declared component. Each snippet is a complete
// format 1 document of one component, so it can be checked by the format 1 importer and merged by
// hand into the real file (its `needs:` or `aliases:` line is the part to copy).
import { stringify } from "yaml";
import type { DeclaredKind, Strength } from "./types";

export interface NeedSnippetInput {
  /** the source whose file declares `from`; null when no source declares it yet */
  source: string | null;
  team: string | null;
  from: string;
  /** kind of `from` when a new component stanza is written */
  fromKind?: DeclaredKind;
  to: string;
  strength: Strength;
  via: string | null;
}

const header = (lines: string[]): string => lines.map((l) => `# ${l}`).join("\n") + "\n";

export function needSnippet(s: NeedSnippetInput): string {
  const need: Record<string, string> = { key: s.to };
  if (s.strength !== "hard") need.strength = s.strength;
  if (s.via) need.via = s.via;
  const component: Record<string, unknown> = { key: s.from, kind: s.fromKind ?? "service", ...(!s.source && s.team ? { team: s.team } : {}) };
  component.needs = [need];
  const where = s.source
    ? [`In the file of source "${s.source}"${s.team ? ` (team ${s.team})` : ""}, add this need under`, `the needs of component "${s.from}":`]
    : [`No file declares "${s.from}" yet: add this component to the file of the team that runs it.`];
  return header([...where, "Seen in traces; check the strength: hard if it is down without this need, soft if degraded."]) +
    stringify({ pinchpoint: 1, source: s.source ?? "your-source", components: [component] }, { lineWidth: 0 });
}

export interface AliasSnippetInput {
  source: string;
  team: string | null;
  key: string;
  kind: DeclaredKind;
  alias: string;
}

export function aliasSnippet(s: AliasSnippetInput): string {
  return header([`In the file of source "${s.source}"${s.team ? ` (team ${s.team})` : ""}, add the alias to component "${s.key}":`]) +
    stringify({ pinchpoint: 1, source: s.source, components: [{ key: s.key, kind: s.kind, aliases: [s.alias] }] }, { lineWidth: 0 });
}
