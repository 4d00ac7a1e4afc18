"use client";

import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/Button";

/** A destructive action asked twice, inline, so the question sits next to what it is about. */
export function ConfirmButton({
  label,
  name,
  question,
  confirmLabel,
  onConfirm,
  disabled,
}: {
  label: string;
  /** accessible name naming what it acts on ("Revoke token ci-push"), when rows repeat the same label */
  name?: string;
  question: ReactNode;
  confirmLabel: string;
  onConfirm: () => Promise<void>;
  disabled?: boolean;
}) {
  const [asking, setAsking] = useState(false);
  const [pending, setPending] = useState(false);
  if (!asking) {
    return (
      <Button type="button" variant="danger" disabled={disabled} onClick={() => setAsking(true)} aria-label={name}>
        {label}
      </Button>
    );
  }
  return (
    <span role="group" aria-label={name ?? label} className="inline-flex flex-wrap items-center gap-2 rounded-md border border-down/50 bg-down/10 px-2 py-1 text-sm">
      <span>{question}</span>
      <Button
        type="button"
        variant="danger"
        disabled={pending}
        onClick={async () => {
          setPending(true);
          await onConfirm();
          setPending(false);
          setAsking(false);
        }}
      >
        {pending ? "Working…" : confirmLabel}
      </Button>
      <Button type="button" variant="ghost" onClick={() => setAsking(false)}>
        Keep it
      </Button>
    </span>
  );
}
