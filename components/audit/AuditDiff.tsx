import { diffRows } from "./diff";

/** Changed fields first and marked; unchanged ones shown dim so the whole record can be read. */
export function AuditDiff({ before, after }: { before: unknown; after: unknown }) {
  const rows = diffRows(before, after);
  if (!rows.length) return <span className="text-xs text-faint">no details recorded</span>;
  const sorted = [...rows.filter((r) => r.changed), ...rows.filter((r) => !r.changed)];
  return (
    <table className="w-full table-fixed text-xs" data-testid="audit-diff">
      <colgroup>
        <col className="w-44" />
        <col />
        <col className="w-6" />
        <col />
      </colgroup>
      <tbody>
        {sorted.map((r) => (
          <tr key={r.path} className={r.changed ? "" : "text-faint"}>
            <td className="truncate py-0.5 pr-3 align-top font-mono text-muted" title={r.path}>{r.path}</td>
            <td className="break-words py-0.5 pr-2 align-top">
              {r.before === undefined ? <span className="text-faint">—</span> : <span className={r.changed ? "text-down line-through decoration-down/50" : ""}>{r.before}</span>}
            </td>
            <td className="py-0.5 pr-2 align-top text-faint">{r.changed ? "→" : "="}</td>
            <td className="break-words py-0.5 align-top">{r.after === undefined ? <span className="text-faint">—</span> : <span className={r.changed ? "text-ok" : ""}>{r.after}</span>}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
