"use client";
// A searchable multi-select (ARIA combobox + listbox): type to narrow, arrows to move, Enter to
// add, Backspace on an empty box removes the last choice. Written here because the two choices
// that would fit (a select library or a headless UI kit) are not installed. With `onText`, the
// options are the caller's answer to what was typed (a server search over a large estate).
import { useId, useMemo, useRef, useState } from "react";

export interface Option {
  value: string;
  label: string;
  hint?: string;
}

export function MultiSelect({
  label,
  options,
  selected,
  onChange,
  placeholder,
  max = 50,
  onText,
}: {
  label: string;
  options: Option[];
  selected: string[];
  onChange: (next: string[]) => void;
  placeholder?: string;
  max?: number;
  /** the text typed so far, for a caller that looks options up as the reader types */
  onText?: (text: string) => void;
}) {
  const id = useId();
  const [text, setText] = useState("");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const input = useRef<HTMLInputElement>(null);
  const chosen = useMemo(() => new Set(selected), [selected]);
  const matches = useMemo(() => {
    const q = text.trim().toLowerCase();
    const pool = options.filter((o) => !chosen.has(o.value));
    const hit = q ? pool.filter((o) => o.value.includes(q) || o.label.toLowerCase().includes(q)) : pool;
    // Keys that start with the text come first: typing "dns" should offer dns-resolver before cdn-dns.
    return hit.sort((a, b) => Number(!a.value.startsWith(q)) - Number(!b.value.startsWith(q)) || a.value.localeCompare(b.value)).slice(0, max);
  }, [options, chosen, text, max]);

  const add = (value: string) => {
    onChange([...selected, value]);
    setText("");
    setActive(0);
    // Closed after each pick so the list does not cover the result; typing or ↓ opens it again.
    setOpen(false);
    input.current?.focus();
  };
  const remove = (value: string) => onChange(selected.filter((v) => v !== value));
  const listId = `${id}-list`;
  const activeOption = open ? matches[Math.min(active, matches.length - 1)] : undefined;

  return (
    <div className="relative flex flex-col gap-1">
      <label htmlFor={id} className="text-xs font-medium text-muted">
        {label}
      </label>
      <div className="flex min-h-9 flex-wrap items-center gap-1 rounded-md border border-line bg-raised px-1.5 py-1 focus-within:border-brass">
        {selected.map((v) => (
          <span key={v} className="inline-flex items-center gap-1 rounded bg-down/15 px-1.5 py-0.5 font-mono text-xs text-ink">
            {v}
            <button type="button" onClick={() => remove(v)} aria-label={`Remove ${v}`} className="text-muted hover:text-down">
              ×
            </button>
          </span>
        ))}
        <input
          ref={input}
          id={id}
          role="combobox"
          aria-expanded={open && matches.length > 0}
          aria-controls={listId}
          aria-autocomplete="list"
          aria-activedescendant={activeOption ? `${id}-${activeOption.value}` : undefined}
          value={text}
          placeholder={selected.length ? "" : placeholder}
          onChange={(e) => {
            setText(e.target.value);
            onText?.(e.target.value.trim());
            setOpen(true);
            setActive(0);
          }}
          onClick={() => setOpen(true)}
          onBlur={() => setTimeout(() => setOpen(false), 120)}
          onKeyDown={(e) => {
            if (e.key === "ArrowDown") {
              e.preventDefault();
              setOpen(true);
              setActive((a) => Math.min(a + 1, matches.length - 1));
            } else if (e.key === "ArrowUp") {
              e.preventDefault();
              setActive((a) => Math.max(a - 1, 0));
            } else if (e.key === "Enter") {
              e.preventDefault();
              if (activeOption) add(activeOption.value);
            } else if (e.key === "Escape") {
              setOpen(false);
            } else if (e.key === "Backspace" && !text && selected.length) {
              remove(selected[selected.length - 1]!);
            }
          }}
          className="min-w-40 flex-1 bg-transparent px-1 py-0.5 text-sm text-ink placeholder:text-faint focus:outline-none"
        />
      </div>
      {open && matches.length > 0 && (
        <ul id={listId} role="listbox" aria-label={`${label}: matches`} className="absolute top-full z-20 mt-1 max-h-72 w-full overflow-auto rounded-md border border-line bg-surface py-1 shadow-lg">
          {matches.map((o, i) => (
            <li
              key={o.value}
              id={`${id}-${o.value}`}
              role="option"
              aria-selected={i === active}
              onMouseDown={(e) => {
                e.preventDefault();
                add(o.value);
              }}
              onMouseEnter={() => setActive(i)}
              className={`flex cursor-pointer items-baseline justify-between gap-3 px-2 py-1 text-sm ${i === active ? "bg-raised text-ink" : "text-muted"}`}
            >
              <span className="font-mono">{o.value}</span>
              {o.hint && <span className="truncate text-xs text-faint">{o.hint}</span>}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
