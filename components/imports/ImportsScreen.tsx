"use client";

import Link from "next/link";
import { useRef, useState, type DragEvent } from "react";
import { useSWRConfig } from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { ROLE_LABELS, roleHas, type Role } from "@/lib/auth/roles";
import type { PushResult } from "@/lib/data/push";
import { MAX_BODY_BYTES } from "@/lib/inventory/limits";
import type { ImportFormat } from "@/lib/inventory/types";
import { FORMATS, detectFormat, sourceNamedIn, suggestSource, type Detection } from "./detect";
import { DiffPreview } from "./DiffPreview";
import { GatedPush, ImpactPanel } from "./ImpactPanel";
import { ImportHistory } from "./ImportHistory";
import { InferredNeeds } from "./InferredNeeds";
import { ImporterNotes } from "./ImporterNotes";
import { IssueList } from "./IssueList";
import { pushFile, type PushOutcome } from "./push";

interface Picked {
  name: string;
  size: number;
  /** The first file's text (the one issue excerpts without a file name point into). */
  text: string;
  /** Every file picked, in order: several make a layered Compose project. */
  files: { name: string; text: string }[];
  detected: Detection;
}

type Stage =
  | { step: "idle" }
  | { step: "checking" }
  | { step: "checked"; outcome: PushOutcome }
  | { step: "pushing"; preview: PushResult }
  | { step: "pushed"; result: PushResult }
  | { step: "push-failed"; outcome: PushOutcome };

const SOURCE_RE = /^[a-z0-9][a-z0-9._-]{0,127}$/;
const field = "mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-sm text-ink outline-none focus:border-brass";

function size(bytes: number) {
  return bytes < 1024 ? `${bytes} B` : bytes < 1024 * 1024 ? `${(bytes / 1024).toFixed(1)} KiB` : `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

const textsOf = (file: Picked | null): Record<string, string> | undefined =>
  file && file.files.length > 1 ? Object.fromEntries(file.files.map((f) => [f.name, f.text])) : undefined;

function Problem({ outcome, text, texts, env }: { outcome: Exclude<PushOutcome, { kind: "ok" }>; text: string | null; texts?: Record<string, string>; env: string }) {
  if (outcome.kind === "invalid") {
    const located = outcome.issues.filter((i) => i.line !== undefined).length;
    return (
      <section aria-label="Errors" className="space-y-3" data-testid="import-errors">
        <div className="rounded-md border border-down/60 bg-down/10 px-3 py-2">
          <p className="font-semibold text-ink">
            {outcome.issues.length === 1 ? "1 problem" : `${outcome.issues.length} problems`} — nothing was changed
          </p>
          <p className="text-sm text-muted">
            {/* The generic server message repeats the heading; a specific one (e.g. a source mismatch) is worth showing. */}
            {/nothing was changed/i.test(outcome.message) ? "" : `${outcome.message}. `}
            {located > 0 ? "Each is shown below at its line in the file, with the lines around it. Fix them all, then check again." : "Fix them, then check again."}
          </p>
        </div>
        {outcome.issues.length > 0 ? <IssueList issues={outcome.issues} text={text} texts={texts} /> : null}
      </section>
    );
  }
  if (outcome.kind === "blocked") {
    return (
      <section aria-label="Blocked by a change policy" className="space-y-2 rounded-md border border-down/60 bg-down/10 px-3 py-2" data-testid="import-blocked">
        <p className="font-semibold">{outcome.message}</p>
        {outcome.issues.length > 0 ? <IssueList issues={outcome.issues} text={text} /> : null}
      </section>
    );
  }
  if (outcome.kind === "conflict") {
    return (
      <section aria-label="Conflict" className="space-y-2 rounded-md border border-down/60 bg-down/10 px-3 py-2" data-testid="import-conflict">
        <p className="font-semibold">Another source already declares some of these components — nothing was changed</p>
        <p className="text-sm">{outcome.message}</p>
        <ul className="list-disc pl-5 text-sm">
          {outcome.issues.map((i) => (
            <li key={i.path}>
              <span className="font-mono">{i.path.replace(/^components\[key=(.*)\]$/, "$1")}</span>: {i.message}
            </li>
          ))}
        </ul>
        <p className="text-xs text-muted">A key belongs to one source. Rename it in one of the files, or remove it from the other source first.</p>
      </section>
    );
  }
  if (outcome.kind === "too-large") {
    return (
      <section aria-label="Too large" className="rounded-md border border-down/60 bg-down/10 px-3 py-2" data-testid="import-too-large">
        <p className="font-semibold">The file is over a limit — nothing was changed</p>
        <p className="text-sm">{outcome.message}</p>
        <ul className="list-disc pl-5 text-sm">
          {outcome.issues.map((i, n) => (
            <li key={n}>
              <span className="font-mono text-xs text-muted">{i.path}</span> {i.message}
            </li>
          ))}
        </ul>
        <p className="text-xs text-muted">Split the inventory into several sources (one file per repository or team) and push each on its own.</p>
      </section>
    );
  }
  return (
    <p role="alert" className="rounded-md border border-down/60 bg-down/10 px-3 py-2 text-sm" data-testid="import-refused">
      {outcome.status === 404 ? (
        <>
          There is no environment <span className="font-mono">{env}</span>, and only an admin can create one with a first push.
        </>
      ) : (
        outcome.message
      )}
    </p>
  );
}

export function ImportsScreen({ env, canUpload, role }: { env: string; canUpload: boolean; role: Role }) {
  const { mutate } = useSWRConfig();
  const picker = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<Picked | null>(null);
  const [format, setFormat] = useState<ImportFormat>("pinchpoint");
  const [source, setSource] = useState("");
  const [profiles, setProfiles] = useState("");
  const [stage, setStage] = useState<Stage>({ step: "idle" });
  const [dragging, setDragging] = useState(false);
  const [readError, setReadError] = useState<string | null>(null);

  const needsSource = format !== "pinchpoint";
  const sourceOk = !needsSource || SOURCE_RE.test(source);

  async function check(next: { file: Picked; format: ImportFormat; source: string; profiles: string }) {
    if (next.format !== "pinchpoint" && !SOURCE_RE.test(next.source)) {
      setStage({ step: "idle" });
      return;
    }
    setStage({ step: "checking" });
    const outcome = await pushFile({
      env,
      format: next.format,
      source: next.format === "pinchpoint" ? "" : next.source,
      text: next.file.text,
      files: next.file.files,
      profiles: next.profiles,
      dryRun: true,
    });
    setStage({ step: "checked", outcome });
  }

  async function choose(list: FileList | File[] | null | undefined) {
    const picked = [...(list ?? [])];
    if (picked.length === 0) return;
    setReadError(null);
    const total = picked.reduce((n, f) => n + f.size, 0);
    if (total > MAX_BODY_BYTES) {
      setFile(null);
      setStage({ step: "idle" });
      setReadError(`${picked.map((f) => f.name).join(", ")}: ${size(total)}; at most ${size(MAX_BODY_BYTES)} is accepted per push. Split it into several sources.`);
      return;
    }
    const files = await Promise.all(picked.map(async (f) => ({ name: f.name, text: await f.text() })));
    // The first file that is not an .env file is the one the format is guessed from.
    const main = files.find((f) => !/(^|\.)env$|^\.env/.test(f.name)) ?? files[0];
    const text = main?.text ?? "";
    const name = files.length === 1 ? (main?.name ?? "") : `${main?.name ?? ""} and ${files.length - 1} more`;
    const detected: Detection = files.length > 1 ? { format: "compose", why: "several files: a layered Compose project, merged in the order chosen" } : detectFormat(main?.name ?? "", text);
    const next: Picked = { name, size: total, text, files, detected };
    const nextSource = detected.format === "pinchpoint" ? "" : (detected.format === "compose" ? sourceNamedIn(text) : null) ?? (source || suggestSource(main?.name ?? "upload"));
    setFile(next);
    setFormat(detected.format);
    setSource(nextSource);
    await check({ file: next, format: detected.format, source: nextSource, profiles });
  }

  async function push(preview: PushResult, overrideReason: string | null = null) {
    if (!file) return;
    setStage({ step: "pushing", preview });
    const outcome = await pushFile({ env, format, source: needsSource ? source : "", text: file.text, files: file.files, profiles, dryRun: false, overrideReason });
    if (outcome.kind === "ok") {
      setStage({ step: "pushed", result: outcome.result });
      // The history's first page now has a new row.
      await mutate((key) => typeof key === "string" && key.startsWith(`/api/v1/environments/${env}/imports`));
    } else setStage({ step: "push-failed", outcome });
  }

  function onDrop(event: DragEvent<HTMLDivElement>) {
    event.preventDefault();
    setDragging(false);
    void choose(event.dataTransfer.files);
  }

  const outcome = stage.step === "checked" ? stage.outcome : stage.step === "push-failed" ? stage.outcome : null;
  const preview = stage.step === "checked" && stage.outcome.kind === "ok" ? stage.outcome.result : stage.step === "pushing" ? stage.preview : null;

  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">
          Imports into <span className="font-mono">{env}</span>
        </h1>
        <p className="mt-1 max-w-3xl text-sm text-muted">
          Upload an inventory file, see exactly what it would change, then push it. CI jobs push the same way with an API token. A push from a source replaces
          everything that source declared before, and nothing else.
        </p>
      </div>

      {!canUpload ? (
        <p className="rounded-md border border-line bg-surface px-4 py-3 text-sm" data-testid="upload-not-allowed">
          Your role ({ROLE_LABELS[role]}) can read the import history below but cannot upload: a push changes the graph every ranking and drill is computed from,
          so it needs the Engineer role or higher. Ask an admin if you need it.
        </p>
      ) : (
        <Card title="Upload a file">
          <div className="space-y-4">
            <div
              onDragOver={(e) => {
                e.preventDefault();
                setDragging(true);
              }}
              onDragLeave={() => setDragging(false)}
              onDrop={onDrop}
              className={`flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-6 py-8 text-center transition-colors ${dragging ? "border-brass bg-brass/10" : "border-line bg-canvas"}`}
              data-testid="dropzone"
            >
              <p className="text-sm">
                Drop a file here, or{" "}
                <button type="button" className="text-brass underline underline-offset-4" onClick={() => picker.current?.click()}>
                  choose one
                </button>
              </p>
              <p className="text-xs text-muted">
                Pinchpoint inventory (YAML/JSON), Compose project, CSV edge list, OTLP/JSON traces or Kubernetes manifests · up to {size(MAX_BODY_BYTES)}. For a
                layered Compose project choose all its files at once (compose.yaml, overrides, .env).
              </p>
              <input
                ref={picker}
                type="file"
                className="sr-only"
                aria-label="Inventory file"
                multiple
                accept=".yaml,.yml,.json,.csv,.tsv,.txt,.env,application/json,application/yaml,text/csv"
                onChange={(e) => {
                  void choose(e.currentTarget.files ? [...e.currentTarget.files] : []);
                  e.currentTarget.value = "";
                }}
              />
            </div>
            {readError && (
              <p role="alert" className="rounded-md border border-down/60 bg-down/10 px-3 py-2 text-sm">
                {readError}
              </p>
            )}

            {file && (
              <div className="grid gap-4 md:grid-cols-[1.3fr_1fr_1fr_auto] md:items-end">
                <div>
                  <div className="text-sm font-medium">File</div>
                  <div className="mt-1 truncate font-mono text-sm" data-testid="picked-file">
                    {file.name} <span className="text-muted">· {size(file.size)}</span>
                  </div>
                  <div className="text-xs text-muted">
                    Read as {FORMATS.find((f) => f.value === file.detected.format)?.label.toLowerCase()}: {file.detected.why}
                  </div>
                </div>
                <label className="block">
                  <span className="text-sm font-medium">Format</span>
                  <select
                    className={field}
                    value={format}
                    onChange={(e) => {
                      const next = e.target.value as ImportFormat;
                      setFormat(next);
                      if (next !== "pinchpoint" && !source) setSource(suggestSource(file.name));
                      setStage({ step: "idle" });
                    }}
                  >
                    {FORMATS.map((f) => (
                      <option key={f.value} value={f.value}>
                        {f.label}
                      </option>
                    ))}
                  </select>
                  <span className="mt-1 block text-xs text-muted">{FORMATS.find((f) => f.value === format)?.hint}</span>
                </label>
                <label className="block">
                  <span className="text-sm font-medium">Source name</span>
                  <input
                    className={`${field} font-mono`}
                    value={needsSource ? source : ""}
                    disabled={!needsSource}
                    placeholder={needsSource ? "e.g. storefront-repo" : "taken from the file"}
                    onChange={(e) => {
                      setSource(e.target.value.trim());
                      setStage({ step: "idle" });
                    }}
                    aria-invalid={needsSource && !sourceOk}
                  />
                  <span className={`mt-1 block text-xs ${needsSource && !sourceOk ? "text-down" : "text-muted"}`}>
                    {needsSource
                      ? sourceOk
                        ? "This upload replaces what this source declared before."
                        : "Lower-case letters, digits, dot, dash or underscore."
                      : "A Pinchpoint file names its own source."}
                  </span>
                </label>
                {format === "compose" && (
                  <label className="block md:col-span-2">
                    <span className="text-sm font-medium">Profiles</span>
                    <input
                      className={`${field} font-mono`}
                      value={profiles}
                      placeholder="none: services with no profile only"
                      onChange={(e) => {
                        setProfiles(e.target.value.replace(/\s+/g, ""));
                        setStage({ step: "idle" });
                      }}
                    />
                    <span className="mt-1 block text-xs text-muted">Compose profiles to include, separated by commas (e.g. debug,test).</span>
                  </label>
                )}
                <Button type="button" disabled={!sourceOk || stage.step === "checking" || stage.step === "pushing"} onClick={() => void check({ file, format, source, profiles })}>
                  {stage.step === "checking" ? "Checking…" : "Check again"}
                </Button>
              </div>
            )}
          </div>
        </Card>
      )}

      {canUpload && file && stage.step === "idle" && (
        <p className="text-sm text-muted">Settings changed: check the file again to see what it would do.</p>
      )}
      {stage.step === "checking" && <p className="text-sm text-muted">Checking {file?.name} against {env} (dry run)…</p>}

      {outcome && outcome.kind !== "ok" && (
        <Card title={stage.step === "push-failed" ? "The push was refused" : "This file cannot be pushed yet"}>
          <Problem outcome={outcome} text={file?.text ?? null} texts={textsOf(file)} env={env} />
        </Card>
      )}

      {preview && (
        <Card
          title={<span data-testid="preview-title">Dry run: what pushing {file?.name} would change</span>}
          action={<span className="text-xs text-muted">nothing has been written yet</span>}
        >
          <div className="space-y-5">
            {!preview.changed && (
              <p className="rounded-md border border-line bg-raised px-3 py-2 text-sm" data-testid="preview-no-change">
                No change: {env} already holds exactly this. Pushing records the import but makes no new snapshot.
              </p>
            )}
            {preview.observed && (
              <p className="text-sm">
                {preview.observed.edges} observed edges from traces. They are kept apart from declared dependencies, so the graph and its rankings do not move.
              </p>
            )}
            {preview.impact && <ImpactPanel impact={preview.impact} fileName={file?.name ?? "file"} env={env} />}
            <DiffPreview diff={preview.diff} />
            {preview.inferred && <InferredNeeds inferred={preview.inferred} />}
            <ImporterNotes notes={preview.notes ?? []} />
            {preview.warnings.length > 0 && (
              <section className="space-y-2" aria-label="Warnings">
                <h3 className="text-sm font-semibold text-degraded">
                  {preview.warnings.length} warning{preview.warnings.length === 1 ? "" : "s"} — the push is allowed
                </h3>
                <IssueList issues={preview.warnings} text={file?.text ?? null} texts={textsOf(file)} tone="warning" />
              </section>
            )}
            <div className="flex flex-wrap items-center gap-3 border-t border-line pt-4">
              <GatedPush impact={preview.impact} env={env} canOverride={roleHas(role, "reviews:write")} busy={stage.step === "pushing"} onPush={(reason) => void push(preview, reason)} />
              <span className="text-xs text-muted">
                This changes Pinchpoint&apos;s picture of {env}, not your systems. Keep the file in its repository too: the next CI push from the same source replaces this upload.
              </span>
            </div>
          </div>
        </Card>
      )}

      {stage.step === "pushed" && (
        <section role="status" className="rounded-lg border border-ok/60 bg-ok/10 px-4 py-3" data-testid="push-result">
          {stage.result.changed && stage.result.snapshot ? (
            <>
              <p className="font-semibold">
                Pushed. {env} is now at{" "}
                <Link className="text-brass underline underline-offset-4" href={`/environments/${env}/history?snapshot=${stage.result.snapshot.number}`}>
                  snapshot #{stage.result.snapshot.number}
                </Link>
                .
              </p>
              <p className="text-sm text-muted">
                The analysis of this snapshot runs in the background; pinch points and drills use it once it finishes.
              </p>
            </>
          ) : (
            <p className="font-semibold">Pushed, no change: the graph was already exactly this, so no snapshot was made.</p>
          )}
          <Button type="button" variant="ghost" className="mt-2" onClick={() => { setFile(null); setStage({ step: "idle" }); }}>
            Upload another file
          </Button>
        </section>
      )}

      <ImportHistory env={env} />
    </div>
  );
}
