"use client";
// Which columns a table shows: a disclosure of checkboxes; the choice is saved per table.
import type { Column, Table } from "@tanstack/react-table";
import { useState } from "react";

export function ColumnsMenu<T>({ table, columns, caption }: { table: Table<T>; columns: Array<Column<T, unknown>>; caption: string }) {
  const hidden = columns.filter((c) => !c.getIsVisible()).length;
  // The checkboxes exist only while the menu is open: closed, a column's name is not a second
  // label on the page beside the form field or filter of the same name.
  const [open, setOpen] = useState(false);
  return (
    <details className="relative" onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary className="cursor-pointer list-none rounded-md border border-line bg-raised px-2.5 py-1.5 text-sm text-ink hover:border-brass" aria-label={`Columns of ${caption}`}>
        Columns{hidden ? ` (${hidden} hidden)` : ""}
      </summary>
      {open && (
      <fieldset className="absolute right-0 z-20 mt-1 w-56 space-y-1 rounded-md border border-line bg-surface p-2 shadow-lg">
        <legend className="sr-only">Columns to show</legend>
        {columns.map((c) => {
          const label = c.columnDef.meta?.label ?? (typeof c.columnDef.header === "string" ? c.columnDef.header : c.id);
          return (
            <label key={c.id} className="flex items-center gap-2 text-sm text-ink">
              <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} className="size-4 accent-[var(--color-brass)]" />
              {label}
            </label>
          );
        })}
        <button type="button" className="mt-1 text-xs text-info hover:underline" onClick={() => table.resetColumnVisibility()}>
          Show the usual columns
        </button>
      </fieldset>
      )}
    </details>
  );
}
