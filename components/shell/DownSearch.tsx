"use client";
// "What is down?" on every page: type the component(s) that failed and land on their blast radius,
// worded as an outage (the drills screen's ?down=1), not as a rehearsal.
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { componentsResponseSchema } from "@/lib/api/schemas/components";
import { useApi } from "@/lib/client/api";

/** Keys typed with commas or spaces between them; the last one is still being typed. */
export function typedKeys(text: string): string[] {
  return text
    .split(/[\s,]+/)
    .map((k) => k.trim())
    .filter(Boolean);
}

export function DownSearch({ env }: { env: string }) {
  const router = useRouter();
  const id = useId();
  const [text, setText] = useState("");
  const keys = typedKeys(text);
  const last = /[\s,]$/.test(text) ? "" : (keys.at(-1) ?? "");
  const matches = useApi(componentsResponseSchema, last.length >= 2 ? `/api/v1/environments/${env}/components?${new URLSearchParams({ q: last, limit: "8" })}` : null, { keepPreviousData: true, revalidateOnFocus: false });
  const before = keys.slice(0, last ? -1 : undefined);
  return (
    <form
      role="search"
      aria-label="What is down?"
      className="min-w-0 flex-1"
      onSubmit={(e) => {
        e.preventDefault();
        if (!keys.length) return;
        router.push(`/environments/${env}/drills?fail=${encodeURIComponent([...new Set(keys)].join(","))}&down=1`);
        setText("");
      }}
    >
      <label htmlFor={id} className="sr-only">
        What is down? Keys separated by commas
      </label>
      <input
        id={id}
        type="search"
        list={`${id}-options`}
        value={text}
        onChange={(e) => setText(e.target.value)}
        placeholder="What is down? e.g. payment-db"
        autoComplete="off"
        className="w-full max-w-72 rounded-md border border-line bg-canvas px-2.5 py-1 text-sm text-ink placeholder:text-muted focus:border-brass focus:outline-none"
        data-testid="down-search"
      />
      <datalist id={`${id}-options`}>
        {(last ? (matches.data?.items ?? []) : []).map((c) => (
          <option key={c.key} value={[...before, c.key].join(", ")}>
            {`${c.name} · ${c.team ?? "unowned"} · tier ${c.tier}`}
          </option>
        ))}
      </datalist>
    </form>
  );
}
