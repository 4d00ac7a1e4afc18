"use client";
// Upload an inventory file (or a layered Compose project), see what it would change and what it
// does to the failure points (a dry run with impact), then push it; the history of pushes below.
import Link from "next/link";
import { useRef, useState, type DragEvent } from "react";
import { useWatch } from "react-hook-form";
import { useSWRConfig } from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { ApiForm, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { InputField, SelectInput } from "@/components/ui/form/fields";
import { uploadSettingsSchema, type PushResult, type UploadSettings } from "@/lib/api/schemas/inventory";
import { ROLE_LABELS, roleHas, type Role } from "@/lib/auth/roles";
import { MAX_BODY_BYTES } from "@/lib/inventory/limits";
import { FORMATS, detectFormat, sourceNamedIn, suggestSource, type Detection } from "./detect";
import { DiffPreview } from "./DiffPreview";
import { GatedPush, ImpactPanel } from "./ImpactPanel";
import { ImportHistory, importsKeyPrefix } from "./ImportHistory";
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
  /** Where each file came from, so "Check again" reads what is on disk now, not the copy read when it was chosen. */
  origins: FileOrigin[];
}

/**
 * A chosen file that can be read again: a File System Access handle where the browser has one
 * (Chromium: it always reads the file as it is now), else the File itself, which Chromium refuses
 * to read once the file changed on disk (NotReadableError) and other browsers read as it is now.
 */
type FileOrigin = { handle: { getFile(): Promise<File> } } | { file: File };

interface PickerWindow {
  showOpenFilePicker?: (options: { multiple: boolean }) => Promise<Array<{ getFile(): Promise<File> }>>;
}

async function readOrigin(origin: FileOrigin): Promise<File> {
  return "handle" in origin ? origin.handle.getFile() : origin.file;
}

type Stage =
  | { step: "idle" }
  | { step: "checking" }
  | { step: "checked"; outcome: PushOutcome }
  | { step: "pushing"; preview: PushResult }
  | { step: "pushed"; result: PushResult }
  | { step: "push-failed"; outcome: PushOutcome };


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
  const [stage, setStage] = useState<Stage>({ step: "idle" });
  const [dragging, setDragging] = useState(false);
  const [readError, setReadError] = useState<string | null>(null);
  const form = useApiForm(uploadSettingsSchema, { format: "pinchpoint", source: "", profiles: "" });
  const format = useWatch({ control: form.control, name: "format" });
  const needsSource = format !== "pinchpoint";
  // Any change to the settings makes the last dry run stale.
  const changed = () => setStage({ step: "idle" });

  async function check(picked: Picked, settings: UploadSettings) {
    setStage({ step: "checking" });
    const outcome = await pushFile({
      env,
      format: settings.format,
      source: settings.format === "pinchpoint" ? "" : (settings.source ?? ""),
      text: picked.text,
      files: picked.files,
      profiles: settings.profiles ?? "",
      dryRun: true,
    });
    setStage({ step: "checked", outcome });
  }

  const checkAgain = form.handleSubmit(async (settings) => {
    if (!file) return;
    // Read the chosen files again: the point of "Check again" is checking the file as fixed since.
    let fresh: Picked;
    try {
      const files = await Promise.all(file.origins.map(async (o) => { const f = await readOrigin(o); return { name: f.name, text: await f.text() }; }));
      const main = files.find((f) => f.name === file.files[0]?.name) ?? files[0];
      fresh = { ...file, files, text: main?.text ?? "", size: files.reduce((n, f) => n + new Blob([f.text]).size, 0) };
    } catch {
      setReadError(`${file.name} changed on disk since it was chosen and this browser will not read it again: choose it once more.`);
      setStage({ step: "idle" });
      picker.current?.click();
      return;
    }
    setReadError(null);
    setFile(fresh);
    await check(fresh, settings);
  });

  /** "choose one": the browser's file picker with handles where it has one, else the file input. */
  async function openPicker() {
    const w = window as unknown as PickerWindow;
    if (!w.showOpenFilePicker) return picker.current?.click();
    try {
      const handles = await w.showOpenFilePicker({ multiple: true });
      const files = await Promise.all(handles.map((h) => h.getFile()));
      await choose(files, handles.map((handle) => ({ handle })));
    } catch (error) {
      // The reader closed the picker (AbortError); anything else falls back to the plain input.
      if (!(error instanceof DOMException && error.name === "AbortError")) picker.current?.click();
    }
  }

  async function choose(list: FileList | File[] | null | undefined, origins?: FileOrigin[]) {
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
    const next: Picked = { name, size: total, text, files, detected, origins: origins ?? picked.map((f) => ({ file: f })) };
    const current = form.getValues();
    const nextSource = detected.format === "pinchpoint" ? "" : ((detected.format === "compose" ? sourceNamedIn(text) : null) ?? (current.source || suggestSource(main?.name ?? "upload")));
    setFile(next);
    form.reset({ format: detected.format, source: nextSource, profiles: current.profiles ?? "" });
    // A guessed setting that does not validate (a source name the user must still give) waits for "Check again".
    await form.handleSubmit((settings) => check(next, settings), () => setStage({ step: "idle" }))();
  }

  async function push(preview: PushResult, overrideReason: string | null = null) {
    if (!file) return;
    const settings = form.getValues();
    setStage({ step: "pushing", preview });
    const outcome = await pushFile({
      env,
      format: settings.format,
      source: needsSource ? (settings.source ?? "") : "",
      text: file.text,
      files: file.files,
      profiles: settings.profiles ?? "",
      dryRun: false,
      overrideReason,
    });
    if (outcome.kind === "ok") {
      setStage({ step: "pushed", result: outcome.result });
      // The history's pages now have a new row.
      await mutate((key) => typeof key === "string" && key.startsWith(importsKeyPrefix(env)));
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
                <button type="button" className="text-brass underline underline-offset-4" onClick={() => void openPicker()}>
                  choose one
                </button>
              </p>
              <p className="text-xs text-muted">
                New to the format?{" "}
                <Link href="/format" className="text-brass underline underline-offset-4">
                  Read the file format reference
                </Link>{" "}
                or{" "}
                <a href="/samples/pinchpoint-sample.yaml" download className="text-brass underline underline-offset-4">
                  download a sample file
                </a>
                .
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
              <ApiForm form={form} onSubmit={checkAgain} label="Upload settings" className="grid gap-4 md:grid-cols-[1.3fr_1fr_1fr_auto] md:items-start">
                <div>
                  <div className="text-sm font-medium">File</div>
                  <div className="mt-1 truncate font-mono text-sm" data-testid="picked-file">
                    {file.name} <span className="text-muted">· {size(file.size)}</span>
                  </div>
                  <div className="text-xs text-muted">
                    Read as {FORMATS.find((f) => f.value === file.detected.format)?.label.toLowerCase()}: {file.detected.why}
                  </div>
                </div>
                <SelectInput
                  name="format"
                  label="Format"
                  options={FORMATS.map((f) => ({ value: f.value, label: f.label }))}
                  help={FORMATS.find((f) => f.value === format)?.hint}
                  onChange={(e: { target: { value: string } }) => {
                    if (e.target.value !== "pinchpoint" && !form.getValues("source")) form.setValue("source", suggestSource(file.name));
                    changed();
                  }}
                />
                <InputField
                  name="source"
                  label="Source name"
                  controlClassName="font-mono"
                  disabled={!needsSource}
                  placeholder={needsSource ? "e.g. storefront-repo" : "taken from the file"}
                  help={needsSource ? "This upload replaces what this source declared before." : "A Pinchpoint file names its own source."}
                  onChange={changed}
                />
                <div className="md:pt-5">
                  <SubmitButton variant="secondary" working="Checking…" disabled={stage.step === "pushing"}>
                    Check again
                  </SubmitButton>
                </div>
                {format === "compose" && (
                  <InputField
                    name="profiles"
                    label="Profiles"
                    className="md:col-span-2"
                    controlClassName="font-mono"
                    placeholder="none: services with no profile only"
                    help="Compose profiles to include, separated by commas (e.g. debug,test)."
                    onChange={changed}
                  />
                )}
              </ApiForm>
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
              <GatedPush impact={preview.impact} diff={preview.diff} env={env} canOverride={roleHas(role, "reviews:write")} busy={stage.step === "pushing"} onPush={(reason) => void push(preview, reason)} />
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
