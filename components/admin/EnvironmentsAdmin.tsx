"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useId, useRef, useState, useTransition, type FormEvent, type ReactNode } from "react";
import { mutate } from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { ageOf, dateTime, plural } from "@/components/ui/format";
import type { DeletedEnvironment } from "@/lib/data/environment-admin";
import type { EnvironmentSummary } from "@/lib/data/environments";
import { sendJson, type RequestProblem } from "./request";

const input = "mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-sm text-ink outline-none focus:border-brass";

function fieldError(problem: RequestProblem | null, field: string): string | undefined {
  return problem?.issues.find((i) => i.path === field || i.path.startsWith(`${field}.`))?.message;
}

/** Other screens (token form, overview) read the environment list through swr: tell them it changed. */
const refreshShared = () => mutate("/api/v1/environments");

function AnalysisState({ env }: { env: EnvironmentSummary }) {
  if (!env.latestSnapshot) return <span className="text-faint">—</span>;
  const a = env.analysis;
  if (!a) return <span className="text-muted">not queued</span>;
  const tone = a.status === "done" ? "text-ok" : a.status === "failed" ? "text-down" : "text-info";
  return (
    <span className={tone}>
      {a.status}
      {a.status === "running" && ` ${Math.round(a.progress * 100)}%`}
    </span>
  );
}

function RenameCell({ env, onRenamed }: { env: EnvironmentSummary; onRenamed: (message: ReactNode) => Promise<void> }) {
  const [editing, setEditing] = useState(false);
  const [problem, setProblem] = useState<RequestProblem | null>(null);
  const [pending, setPending] = useState(false);
  const id = useId();

  if (!editing) {
    return (
      <span className="inline-flex items-center gap-2">
        <span>{env.name}</span>
        <Button type="button" variant="ghost" className="px-2 py-0.5 text-xs" aria-label={`Rename ${env.slug}`} onClick={() => setEditing(true)}>
          Rename
        </Button>
      </span>
    );
  }

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const name = String(new FormData(event.currentTarget).get("name") ?? "");
    setPending(true);
    setProblem(null);
    const result = await sendJson<EnvironmentSummary>(`/api/v1/environments/${env.slug}`, "PATCH", { name });
    setPending(false);
    if (!result.ok) {
      setProblem(result.problem);
      return;
    }
    setEditing(false);
    await onRenamed(`Renamed ${env.slug} to “${result.data.name}”.`);
  }

  const error = fieldError(problem, "name") ?? problem?.message;
  return (
    <form onSubmit={onSubmit} className="flex flex-wrap items-start gap-2" aria-label={`Rename ${env.slug}`} noValidate>
      <label htmlFor={id} className="sr-only">
        New name for {env.slug}
      </label>
      <input
        id={id}
        name="name"
        defaultValue={env.name}
        maxLength={200}
        autoFocus
        aria-invalid={!!error}
        aria-describedby={error ? `${id}-error` : undefined}
        onKeyDown={(e) => e.key === "Escape" && setEditing(false)}
        className="w-56 rounded-md border border-line bg-raised px-2 py-1 text-sm text-ink outline-none focus:border-brass"
      />
      <Button type="submit" variant="secondary" className="py-1" disabled={pending}>
        {pending ? "Saving…" : "Save name"}
      </Button>
      <Button type="button" variant="ghost" className="py-1" onClick={() => setEditing(false)}>
        Cancel
      </Button>
      {error && (
        <span id={`${id}-error`} role="alert" className="basis-full text-xs text-down">
          {error}
        </span>
      )}
    </form>
  );
}

/** A modal that asks for the slug to be typed: deleting takes the whole graph and its history with it. */
function DeleteDialog({ env, onClose, onDeleted }: { env: EnvironmentSummary; onClose: () => void; onDeleted: (result: DeletedEnvironment) => Promise<void> }) {
  const ref = useRef<HTMLDialogElement>(null);
  const [typed, setTyped] = useState("");
  const [problem, setProblem] = useState<RequestProblem | null>(null);
  const [pending, setPending] = useState(false);
  const titleId = useId();
  const inputId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (dialog && !dialog.open) dialog.showModal();
  }, []);

  const matches = typed === env.slug;

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!matches) return;
    setPending(true);
    setProblem(null);
    const result = await sendJson<DeletedEnvironment>(`/api/v1/environments/${env.slug}?confirm=${encodeURIComponent(typed)}`, "DELETE");
    setPending(false);
    if (!result.ok) {
      setProblem(result.problem);
      return;
    }
    await onDeleted(result.data);
  }

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      className="m-auto w-full max-w-lg rounded-lg border border-down/60 bg-surface p-0 text-ink shadow-2xl backdrop:bg-black/60"
    >
      <form onSubmit={onSubmit} className="space-y-4 p-5">
        <h2 id={titleId} className="text-lg font-semibold">
          Delete <span className="font-mono">{env.slug}</span> for good?
        </h2>
        <div className="space-y-2 text-sm">
          {env.componentCount === 0 && env.snapshotCount === 0 ? (
            <p>
              It has no components or snapshots yet.{" "}
              {env.liveTokenCount > 0 ? (
                <>
                  <strong>{plural(env.liveTokenCount, "live API token")}</strong> bound to it will be deleted with it, and CI jobs using them get 401 from their next push.
                </>
              ) : (
                "No live API token is bound to it; any revoked ones bound to it are deleted with it."
              )}
            </p>
          ) : (
            <>
              <p>This removes, with no way back:</p>
              <ul className="list-disc space-y-1 pl-5">
                <li>its {plural(env.componentCount, "component")} with their dependencies, owners&apos; notes and map positions;</li>
                <li>its {plural(env.snapshotCount, "snapshot")} with their analyses, risk reviews and import history;</li>
                <li>
                  {env.liveTokenCount === 0 ? (
                    "every API token bound to it (none of them is live)."
                  ) : (
                    <>
                      <strong>{plural(env.liveTokenCount, "live API token")}</strong> bound to it: they are deleted, and CI jobs using them get 401 from their next push.
                    </>
                  )}
                </li>
              </ul>
            </>
          )}
          <p className="text-muted">
            The audit log keeps its entries. A later push by an admin would start a new, empty <span className="font-mono">{env.slug}</span> from snapshot 1.
          </p>
        </div>
        <div>
          <label htmlFor={inputId} className="text-sm font-medium">
            Type <span className="font-mono">{env.slug}</span> to confirm
          </label>
          <input
            id={inputId}
            value={typed}
            onChange={(e) => setTyped(e.target.value)}
            autoComplete="off"
            spellCheck={false}
            autoFocus
            className={`${input} font-mono`}
          />
        </div>
        {problem && (
          <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm">
            {problem.message}
          </p>
        )}
        <div className="flex flex-wrap justify-end gap-2">
          <Button type="button" variant="ghost" onClick={() => ref.current?.close()}>
            Keep it
          </Button>
          <Button type="submit" variant="danger" disabled={!matches || pending}>
            {pending ? "Deleting…" : `Delete ${env.slug}`}
          </Button>
        </div>
      </form>
    </dialog>
  );
}

export function EnvironmentsAdmin({ environments }: { environments: EnvironmentSummary[] }) {
  const router = useRouter();
  const [, startRefresh] = useTransition();
  const [problem, setProblem] = useState<RequestProblem | null>(null);
  const [pending, setPending] = useState(false);
  const [notice, setNotice] = useState<ReactNode>(null);
  const [deleting, setDeleting] = useState<EnvironmentSummary | null>(null);
  const formId = useId();

  async function refresh(message: ReactNode) {
    setNotice(message);
    setProblem(null);
    startRefresh(() => router.refresh());
    await refreshShared();
  }

  async function onCreate(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    const slug = String(data.get("slug") ?? "").trim();
    const name = String(data.get("name") ?? "").trim();
    setPending(true);
    setProblem(null);
    setNotice(null);
    const result = await sendJson<EnvironmentSummary>("/api/v1/environments", "POST", { slug, ...(name ? { name } : {}) });
    setPending(false);
    if (!result.ok) {
      setProblem(result.problem);
      return;
    }
    form.reset();
    const slugCreated = result.data.slug;
    await refresh(
      <>
        Created <span className="font-mono">{slugCreated}</span>. It stays empty until its first push, or an{" "}
        <Link href={`/environments/${slugCreated}/imports`} className="text-brass underline underline-offset-4">
          upload on its imports page
        </Link>
        .
      </>,
    );
  }

  return (
    <div className="space-y-6">
      <Card title="New environment">
        <form onSubmit={onCreate} onInput={() => problem && setProblem(null)} className="grid gap-4 md:grid-cols-[1fr_1fr_auto] md:items-start" noValidate>
          <div>
            <label htmlFor={`${formId}-slug`} className="text-sm font-medium">
              Slug
            </label>
            <input
              id={`${formId}-slug`}
              name="slug"
              required
              maxLength={63}
              placeholder="staging"
              autoComplete="off"
              spellCheck={false}
              className={`${input} font-mono`}
              aria-invalid={!!fieldError(problem, "slug")}
              aria-describedby={`${formId}-slug-help`}
            />
            <span id={`${formId}-slug-help`} className="mt-1 block text-xs text-muted">
              Lower-case letters, digits and dashes. It goes into every URL and token binding and cannot change later.
            </span>
            {fieldError(problem, "slug") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "slug")}</span>}
          </div>
          <div>
            <label htmlFor={`${formId}-name`} className="text-sm font-medium">
              Display name
            </label>
            <input
              id={`${formId}-name`}
              name="name"
              maxLength={200}
              placeholder="Staging (optional)"
              className={input}
              aria-invalid={!!fieldError(problem, "name")}
              aria-describedby={`${formId}-name-help`}
            />
            <span id={`${formId}-name-help`} className="mt-1 block text-xs text-muted">
              Optional; defaults to the slug. Can be renamed at any time.
            </span>
            {fieldError(problem, "name") && <span className="mt-1 block text-xs text-down">{fieldError(problem, "name")}</span>}
          </div>
          <div className="md:pt-6">
            <Button type="submit" variant="primary" disabled={pending}>
              {pending ? "Creating…" : "Create environment"}
            </Button>
          </div>
          {problem && (
            <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm md:col-span-3">
              {problem.message}
            </p>
          )}
        </form>
      </Card>

      <Card title={`Environments (${environments.length})`}>
        {notice && (
          <p role="status" className="mb-3 rounded-md border border-line bg-raised px-3 py-2 text-sm">
            {notice}
          </p>
        )}
        {environments.length === 0 ? (
          <p className="text-sm text-muted">No environments yet. Create one above, or push an inventory as an admin.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="text-xs uppercase tracking-wide text-faint">
                <tr>
                  <th className="py-2 pr-4 font-medium">Slug</th>
                  <th className="py-2 pr-4 font-medium">Name</th>
                  <th className="py-2 pr-4 text-right font-medium">Components</th>
                  <th className="py-2 pr-4 font-medium">Latest snapshot</th>
                  <th className="py-2 pr-4 font-medium">Analysis</th>
                  <th className="py-2 pr-4 font-medium">Created</th>
                  <th className="py-2 font-medium">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {environments.map((env) => (
                  <tr key={env.id} data-testid={`environment-row-${env.slug}`} className="border-t border-line align-middle">
                    <td className="py-2 pr-4 whitespace-nowrap">
                      <Link href={`/environments/${env.slug}`} className="font-mono text-ink underline decoration-line underline-offset-4 hover:decoration-brass">
                        {env.slug}
                      </Link>
                      {env.isDefault && <span className="ml-2 rounded border border-brass/60 px-1.5 py-0.5 text-xs text-brass">default</span>}
                    </td>
                    <td className="py-2 pr-4">
                      <RenameCell env={env} onRenamed={refresh} />
                    </td>
                    <td className="py-2 pr-4 text-right font-mono tabular-nums">{env.componentCount}</td>
                    <td className="py-2 pr-4 whitespace-nowrap">
                      {env.latestSnapshot ? (
                        <>
                          <span className="font-mono">#{env.latestSnapshot.number}</span>{" "}
                          <span className="text-muted" suppressHydrationWarning title={dateTime(env.latestSnapshot.createdAt)}>
                            {ageOf(env.latestSnapshot.createdAt)}
                          </span>
                        </>
                      ) : (
                        <span className="text-muted">no push yet</span>
                      )}
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">
                      <AnalysisState env={env} />
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">{dateTime(env.createdAt)}</td>
                    <td className="py-2 text-right whitespace-nowrap">
                      {env.isDefault ? (
                        <span className="text-xs text-muted" title="The overview at / shows this environment (PINCHPOINT_DEFAULT_ENV)">
                          default: cannot be deleted
                        </span>
                      ) : (
                        <Button type="button" variant="danger" aria-label={`Delete ${env.slug}`} onClick={() => setDeleting(env)}>
                          Delete…
                        </Button>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        <p className="mt-3 text-xs text-muted">
          An environment is one graph. Pushes fill it (<span className="font-mono">POST /api/v1/environments/&#123;slug&#125;/inventory</span>); each
          change makes a numbered snapshot.
        </p>
      </Card>

      {deleting && (
        <DeleteDialog
          key={deleting.id}
          env={deleting}
          onClose={() => setDeleting(null)}
          onDeleted={async (result) => {
            setDeleting(null);
            await refresh(
              `Deleted ${result.slug}: ${plural(result.removed.components, "component")}, ${plural(result.removed.snapshots, "snapshot")} and ${plural(result.removed.tokens, "bound token")} removed.`,
            );
          }}
        />
      )}
    </div>
  );
}
