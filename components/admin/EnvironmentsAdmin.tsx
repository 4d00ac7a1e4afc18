"use client";
// Environments (admin): create one, rename it, delete it with its whole graph after typing its slug.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useId, useRef, useState, useTransition, type ReactNode } from "react";
import { useWatch } from "react-hook-form";
import { mutate } from "swr";
import { z } from "zod";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { plural } from "@/components/ui/format";
import { When } from "@/components/ui/When";
import {
  createEnvironmentSchema,
  deletedEnvironmentSchema,
  deleteEnvironmentQuerySchema,
  environmentSummarySchema,
  renameEnvironmentSchema,
  type DeletedEnvironment,
  type EnvironmentSummary,
} from "@/lib/api/schemas/environments";
import { sendJson } from "@/lib/client/api";

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
  const form = useApiForm(renameEnvironmentSchema, { name: env.name });
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
  const onSubmit = submitWith(
    form,
    (values) => sendJson(environmentSummarySchema, `/api/v1/environments/${env.slug}`, "PATCH", values),
    async (renamed) => {
      setEditing(false);
      await onRenamed(`Renamed ${env.slug} to “${renamed.name}”.`);
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label={`Rename ${env.slug}`} className="flex flex-wrap items-start gap-2">
      <InputField
        name="name"
        label={<span className="sr-only">New name for {env.slug}</span>}
        maxLength={200}
        autoFocus
        onKeyDown={(e) => e.key === "Escape" && setEditing(false)}
        controlClassName="w-56 py-1"
      />
      <SubmitButton variant="secondary" className="py-1" working="Saving…">
        Save name
      </SubmitButton>
      <Button type="button" variant="ghost" className="py-1" onClick={() => setEditing(false)}>
        Cancel
      </Button>
      <FormProblem className="basis-full" />
    </ApiForm>
  );
}

/** A modal that asks for the slug to be typed: deleting takes the whole graph and its history with it. */
function DeleteDialog({ env, onClose, onDeleted }: { env: EnvironmentSummary; onClose: () => void; onDeleted: (result: DeletedEnvironment) => Promise<void> }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  // The route's own query (?confirm=), held to this environment's slug before anything is sent.
  const form = useApiForm(deleteEnvironmentQuerySchema.extend({ confirm: z.literal(env.slug, `type ${env.slug} exactly`) }), { confirm: "" });
  const typed = useWatch({ control: form.control, name: "confirm" });

  useEffect(() => {
    const dialog = ref.current;
    if (dialog && !dialog.open) dialog.showModal();
  }, []);

  const onSubmit = submitWith(form, ({ confirm }) => sendJson(deletedEnvironmentSchema, `/api/v1/environments/${env.slug}?confirm=${encodeURIComponent(confirm)}`, "DELETE"), onDeleted);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      className="m-auto w-full max-w-lg rounded-lg border border-down/60 bg-surface p-0 text-ink shadow-2xl backdrop:bg-black/60"
    >
      <ApiForm form={form} onSubmit={onSubmit} label={`Delete ${env.slug}`} className="space-y-4 p-5">
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
        <InputField
          name="confirm"
          label={
            <>
              Type <span className="font-mono">{env.slug}</span> to confirm
            </>
          }
          autoComplete="off"
          spellCheck={false}
          autoFocus
          controlClassName="font-mono"
        />
        <FormProblem />
        <div className="flex flex-wrap justify-end gap-2">
          <Button type="button" variant="ghost" onClick={() => ref.current?.close()}>
            Keep it
          </Button>
          <SubmitButton variant="danger" disabled={typed !== env.slug} working="Deleting…">
            Delete {env.slug}
          </SubmitButton>
        </div>
      </ApiForm>
    </dialog>
  );
}

function CreateEnvironment({ onCreated }: { onCreated: (slug: string) => Promise<void> }) {
  const form = useApiForm(createEnvironmentSchema, { slug: "", name: undefined });
  const onSubmit = submitWith(
    form,
    (values) => sendJson(environmentSummarySchema, "/api/v1/environments", "POST", values),
    async (created) => {
      form.reset();
      await onCreated(created.slug);
    },
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label="New environment" className="grid gap-4 md:grid-cols-[1fr_1fr_auto] md:items-start">
      <InputField
        name="slug"
        label="Slug"
        maxLength={63}
        placeholder="staging"
        autoComplete="off"
        spellCheck={false}
        controlClassName="font-mono"
        help="Lower-case letters, digits and dashes. It goes into every URL and token binding and cannot change later."
      />
      <InputField name="name" label="Display name" maxLength={200} placeholder="Staging (optional)" blank="absent" help="Optional; defaults to the slug. Can be renamed at any time." />
      <div className="md:pt-5">
        <SubmitButton working="Creating…">Create environment</SubmitButton>
      </div>
      <FormProblem className="md:col-span-3" />
    </ApiForm>
  );
}

const col = createColumnHelper<EnvironmentSummary>();

function columns(refresh: (message: ReactNode) => Promise<void>, remove: (env: EnvironmentSummary) => void) {
  return [
    col.accessor("slug", {
      header: "Slug",
      meta: { fixed: true, className: "whitespace-nowrap" },
      cell: (i) => (
        <>
          <Link href={`/environments/${i.getValue()}`} className="font-mono text-ink underline decoration-line underline-offset-4 hover:decoration-brass">
            {i.getValue()}
          </Link>
          {i.row.original.isDefault && <span className="ml-2 rounded border border-brass/60 px-1.5 py-0.5 text-xs text-brass">default</span>}
        </>
      ),
    }),
    col.accessor("name", { header: "Name", cell: (i) => <RenameCell env={i.row.original} onRenamed={refresh} /> }),
    col.accessor("componentCount", { header: "Components", meta: { numeric: true } }),
    col.accessor((e) => e.latestSnapshot?.number ?? 0, {
      id: "latestSnapshot",
      header: "Latest snapshot",
      cell: (i) => {
        const latest = i.row.original.latestSnapshot;
        return latest ? (
          <span className="whitespace-nowrap">
            <span className="font-mono">#{latest.number}</span> <When at={latest.createdAt} />
          </span>
        ) : (
          <span className="text-muted">no push yet</span>
        );
      },
    }),
    col.accessor((e) => e.analysis?.status ?? "", { id: "analysis", header: "Analysis", cell: (i) => <AnalysisState env={i.row.original} /> }),
    col.accessor("createdAt", { header: "Created", cell: (i) => <When at={i.getValue()} /> }),
    col.accessor("liveTokenCount", { header: "Live tokens", meta: { numeric: true, hidden: true } }),
    col.display({
      id: "actions",
      header: () => <span className="sr-only">Actions</span>,
      meta: { fixed: true, label: "Actions", className: "whitespace-nowrap text-right" },
      cell: (i) =>
        i.row.original.isDefault ? (
          <span className="text-xs text-muted" title="The overview at / shows this environment (PINCHPOINT_DEFAULT_ENV)">
            default: cannot be deleted
          </span>
        ) : (
          <Button type="button" variant="danger" aria-label={`Delete ${i.row.original.slug}`} onClick={() => remove(i.row.original)}>
            Delete…
          </Button>
        ),
    }),
  ];
}

export function EnvironmentsAdmin({ environments }: { environments: EnvironmentSummary[] }) {
  const router = useRouter();
  const [, startRefresh] = useTransition();
  const [notice, setNotice] = useState<ReactNode>(null);
  const [deleting, setDeleting] = useState<EnvironmentSummary | null>(null);

  async function refresh(message: ReactNode) {
    setNotice(message);
    startRefresh(() => router.refresh());
    await refreshShared();
  }

  return (
    <div className="space-y-6">
      <Card title="New environment">
        <CreateEnvironment
          onCreated={(slug) =>
            refresh(
              <>
                Created <span className="font-mono">{slug}</span>. It stays empty until its first push, or an{" "}
                <Link href={`/environments/${slug}/imports`} className="text-brass underline underline-offset-4">
                  upload on its imports page
                </Link>
                .
              </>,
            )
          }
        />
      </Card>

      <Card title={`Environments (${environments.length})`}>
        {notice && (
          <p role="status" className="mb-3 rounded-md border border-line bg-raised px-3 py-2 text-sm">
            {notice}
          </p>
        )}
        <DataTable
          id="environments"
          caption="Environments"
          columns={columns(refresh, setDeleting)}
          data={environments}
          rowKey={(e) => e.id}
          rowTestId={(e) => `environment-row-${e.slug}`}
          paging={{ mode: "client", pageSize: 50, initialSort: [{ id: "slug", desc: false }], search: { label: "Find an environment", placeholder: "slug or name" } }}
          noun={["environment", "environments"]}
          empty="No environments yet. Create one above, or push an inventory as an admin."
        />
        <p className="mt-3 text-xs text-muted">
          An environment is one graph. Pushes fill it (<span className="font-mono">POST /api/v1/environments/&#123;slug&#125;/inventory</span>); each change makes a numbered
          snapshot.
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
