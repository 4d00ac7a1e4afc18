"use client";
// Filter controls bound to a server list's state (useListState): each change goes to the URL and
// back to the first page. Text waits for a pause in typing, so a word is one request, not one per key.
import { useEffect, useRef, useState } from "react";
import { CheckField, SelectField, TextField } from "@/components/ui/LabelledField";
import type { ListState } from "./list-state";

const TYPING_PAUSE_MS = 250;

export function ListSearch({ list, name = "q", label, placeholder, className = "w-56" }: { list: ListState; name?: string; label: string; placeholder?: string; className?: string }) {
  const current = list.filters[name] ?? "";
  const [text, setText] = useState(current);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  // Follow the URL when it changes from elsewhere (Clear filters, back button).
  const [seen, setSeen] = useState(current);
  if (seen !== current) {
    setSeen(current);
    setText(current);
  }
  useEffect(() => () => {
    if (timer.current) clearTimeout(timer.current);
  }, []);
  return (
    <TextField
      label={label}
      type="search"
      value={text}
      placeholder={placeholder}
      className={className}
      onChange={(e) => {
        const next = e.target.value;
        setText(next);
        if (timer.current) clearTimeout(timer.current);
        timer.current = setTimeout(() => {
          setSeen(next.trim());
          list.setFilter(name, next.trim() || null);
        }, TYPING_PAUSE_MS);
      }}
    />
  );
}

export function ListSelect({ list, name, label, options, all }: { list: ListState; name: string; label: string; options: Array<{ value: string; label: string }>; all: string }) {
  return <SelectField label={label} value={list.filters[name] ?? ""} onChange={(e) => list.setFilter(name, e.target.value || null)} options={[{ value: "", label: all }, ...options]} />;
}

export function ListCheck({ list, name, label }: { list: ListState; name: string; label: string }) {
  return (
    <div className="pb-1.5">
      <CheckField label={label} checked={list.filters[name] === "true"} onChange={(e) => list.setFilter(name, e.target.checked ? "true" : null)} />
    </div>
  );
}
