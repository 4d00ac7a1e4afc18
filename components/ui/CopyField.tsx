"use client";

import { useRef, useState } from "react";
import { Button } from "@/components/ui/Button";

/** A secret in a read-only field with a copy button; falls back to selecting the text when the clipboard is refused. */
export function CopyField({ value, label, testId }: { value: string; label: string; testId?: string }) {
  const input = useRef<HTMLInputElement>(null);
  const [state, setState] = useState<"idle" | "copied" | "select">("idle");
  async function copy() {
    try {
      await navigator.clipboard.writeText(value);
      setState("copied");
    } catch {
      input.current?.select();
      setState("select");
    }
  }
  return (
    <div className="flex flex-wrap items-center gap-2">
      <input
        ref={input}
        readOnly
        value={value}
        aria-label={label}
        data-testid={testId}
        onFocus={(e) => e.currentTarget.select()}
        className="min-w-0 flex-1 rounded-md border border-line bg-canvas px-3 py-2 font-mono text-sm text-ink"
      />
      <Button type="button" onClick={copy}>
        {state === "copied" ? "Copied" : "Copy"}
      </Button>
      {state === "select" && <span className="text-xs text-muted">Selected: press Ctrl+C to copy.</span>}
    </div>
  );
}
