"use client";
// The audit log: who did what, when, with before and after; paged, sorted and filtered on the
// server. The filters are a form (the same rules as the route: calendar days, `from` not after
// `to`) and live in the URL, so a view of the log can be pasted into an incident channel.
import { createColumnHelper } from "@tanstack/react-table";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { useListState } from "@/components/ui/data-table/list-state";
import { ApiForm, FormProblem, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { Label, Select } from "@/components/ui/Field";
import { When } from "@/components/ui/When";
import { AUDIT_FILTERS, AUDIT_LIST, auditFiltersSchema, auditPageSchema, type AuditEntry } from "@/lib/api/schemas/reviews";
import { useApi } from "@/lib/client/api";
import { useFormContext } from "react-hook-form";
import { AuditDiff } from "./AuditDiff";

const filtersFormSchema = auditFiltersSchema.refine((q) => !q.from || !q.to || q.from <= q.to, { message: "`from` is after `to`", path: ["from"] });

const col = createColumnHelper<AuditEntry>();

const COLUMNS = [
  col.accessor("at", { header: "When", meta: { fixed: true, className: "text-xs text-muted" }, cell: (i) => <When at={i.getValue()} seconds /> }),
  col.accessor("action", { header: "Action", cell: (i) => <span className="font-mono text-xs text-ink" data-testid="audit-action">{i.getValue()}</span> }),
  col.accessor("actorLabel", {
    id: "actor",
    header: "Who",
    cell: (i) => (
      <span className="block max-w-56 truncate text-xs text-muted" title={i.getValue()}>
        {i.row.original.actorType === "user" ? "" : `${i.row.original.actorType} · `}
        {i.getValue()}
      </span>
    ),
  }),
  col.accessor((e) => `${e.targetType} ${e.targetId}`, { id: "target", header: "Target", cell: (i) => <span className="font-mono text-xs text-faint">{i.getValue()}</span> }),
  col.accessor((e) => e.environment ?? "", { id: "environment", header: "Environment", cell: (i) => <span className="font-mono text-xs text-faint">{i.getValue() || "—"}</span> }),
  col.display({ id: "change", header: "Before → after", meta: { className: "min-w-96" }, cell: (i) => <AuditDiff before={i.row.original.before} after={i.row.original.after} /> }),
];

/** Families (review, team, …) and every action recorded, as the filter's choices. */
function ActionSelect({ actions }: { actions: string[] }) {
  const { register } = useFormContext();
  const families = [...new Set(actions.map((a) => a.split(".")[0] ?? a))];
  return (
    <div>
      <Label htmlFor="f-action">Action</Label>
      <Select id="f-action" {...register("action", { setValueAs: (v: string) => v || undefined })}>
        <option value="">any</option>
        {families.map((family) => (
          <optgroup key={family} label={family}>
            <option value={family}>{family} (all)</option>
            {actions
              .filter((a) => a.startsWith(`${family}.`))
              .map((a) => (
                <option key={a} value={a}>
                  {a}
                </option>
              ))}
          </optgroup>
        ))}
      </Select>
    </div>
  );
}

export function AuditLog() {
  const list = useListState(AUDIT_LIST, { filters: AUDIT_FILTERS, pageSize: 25 });
  const { data, error, isValidating } = useApi(auditPageSchema, `/api/v1/audit?${list.query}`, { keepPreviousData: true });
  const form = useApiForm(filtersFormSchema, list.filters);
  const onSubmit = form.handleSubmit((values) => list.setFilters(Object.fromEntries(AUDIT_FILTERS.map((f) => [f, values[f] ?? null]))));

  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Audit log</h1>
        <p className="mt-1 text-sm text-muted">Every change made in Pinchpoint: pushes, owners, reviews, weights, teams, roles and tokens. Append-only.</p>
      </div>
      <Card>
        <ApiForm form={form} onSubmit={onSubmit} label="Filter the audit log" className="grid gap-3 md:grid-cols-7">
          <ActionSelect actions={data?.actions ?? []} />
          <InputField name="actor" label="Who" placeholder="e-mail or token" blank="absent" />
          <InputField name="environment" label="Environment" placeholder="production" blank="absent" controlClassName="font-mono" />
          <InputField name="target" label="Target" placeholder="key, team, token…" blank="absent" controlClassName="font-mono" />
          <InputField name="from" label="From (UTC day)" type="date" blank="absent" />
          <InputField name="to" label="To (UTC day)" type="date" blank="absent" />
          <div className="flex items-start gap-2 pt-5">
            <SubmitButton>Filter</SubmitButton>
            <Button
              type="button"
              variant="ghost"
              onClick={() => {
                form.reset(Object.fromEntries(AUDIT_FILTERS.map((f) => [f, undefined])));
                list.clearFilters();
              }}
            >
              Reset
            </Button>
          </div>
          <FormProblem className="md:col-span-7" />
        </ApiForm>
      </Card>
      <Card title={<span data-testid="audit-total">{!data ? "Loading…" : `${data.total} event${data.total === 1 ? "" : "s"}`}</span>}>
        <DataTable
          id="audit"
          testId="audit-events"
          caption="Audit events, newest first"
          columns={COLUMNS}
          data={data?.items}
          rowKey={(e) => e.id}
          error={error}
          loading={isValidating}
          paging={{ mode: "server", list, total: data?.total }}
          noun={["event", "events"]}
          empty="Nothing matches these filters."
        />
      </Card>
    </div>
  );
}
