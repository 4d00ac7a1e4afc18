"use client";
// The incident summary an on-call engineer pastes into the incident channel: one copy button, what
// happened to the copy, and the text itself (opened when the browser refuses the clipboard, so it can
// be selected by hand). Drills and the live incident screen show the same block.
import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/Button";

export function SummaryCopy({ summary, children }: { summary: string; /** more actions on the button's row */ children?: ReactNode }) {
  const [copied, setCopied] = useState<"idle" | "copied" | "failed">("idle");
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(summary);
      setCopied("copied");
    } catch {
      setCopied("failed");
    }
    setTimeout(() => setCopied("idle"), 4000);
  };
  return (
    <>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="button" variant="primary" onClick={() => void copy()}>
          Copy incident summary
        </Button>
        <span role="status" className="text-sm text-muted">
          {copied === "copied" ? "Copied to the clipboard." : copied === "failed" ? "The browser refused the clipboard: select the text below instead." : ""}
        </span>
        {children}
      </div>
      <details className="rounded-md border border-line bg-surface px-3 py-2 text-sm" open={copied === "failed"}>
        <summary className="cursor-pointer text-muted">Summary text</summary>
        <pre className="mt-2 whitespace-pre-wrap font-mono text-xs text-ink" data-testid="incident-summary">
          {summary}
        </pre>
      </details>
    </>
  );
}
