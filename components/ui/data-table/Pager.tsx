"use client";
// Where in a list the reader is, and the way to the next page: "26–50 of 45,375 components".
import { Button } from "@/components/ui/Button";
import { PAGE_SIZES } from "./list-query";

export function Pager({
  label,
  page,
  pageSize,
  total,
  noun,
  onPage,
  onPageSize,
  maxPageSize,
  testId,
}: {
  label: string;
  page: number;
  pageSize: number;
  total: number | undefined;
  noun: [string, string];
  onPage: (page: number) => void;
  onPageSize: (size: number) => void;
  maxPageSize?: number;
  testId?: string;
}) {
  const pages = Math.max(1, Math.ceil((total ?? 0) / pageSize));
  const first = (page - 1) * pageSize + 1;
  const words = total === undefined ? "Loading…" : total === 0 ? `0 ${noun[1]}` : `${first.toLocaleString()}–${Math.min(page * pageSize, total).toLocaleString()} of ${total.toLocaleString()} ${total === 1 ? noun[0] : noun[1]}`;
  return (
    <nav aria-label={`Pages of ${label}`} className="flex flex-wrap items-center justify-between gap-3 text-sm text-muted">
      <span data-testid={testId} role="status">
        {words}
        {total !== undefined && pages > 1 ? ` · page ${page.toLocaleString()} of ${pages.toLocaleString()}` : ""}
      </span>
      <div className="flex flex-wrap items-center gap-2">
        <label className="flex items-center gap-1.5 text-xs">
          Rows per page
          <select value={pageSize} onChange={(e) => onPageSize(Number(e.target.value))} className="rounded-md border border-line bg-raised px-1.5 py-1 text-sm text-ink">
            {PAGE_SIZES.filter((n) => n <= (maxPageSize ?? Infinity)).map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        </label>
        <Button type="button" disabled={page <= 1} onClick={() => onPage(page - 1)}>
          Previous page
        </Button>
        <Button type="button" disabled={page >= pages} onClick={() => onPage(page + 1)}>
          Next page
        </Button>
      </div>
    </nav>
  );
}
