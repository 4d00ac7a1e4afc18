"use client";
// Claim (a lead, for a team they lead) or assign (architects and admins, any team) an owner for one
// unowned component, from any screen that shows it; the claim confirms with an undo. The server
// (annotateComponent) enforces the same rule: the control is shown only to those it would accept.
import { useState } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/Button";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { SelectInput } from "@/components/ui/form/fields";
import { slugSchema } from "@/lib/api/schemas/common";
import { annotationResultSchema } from "@/lib/api/schemas/components";
import { sendJson } from "@/lib/client/api";

export interface OwnerViewer {
  /** slugs of the teams the viewer leads */
  ledTeams: string[];
  /** architects and admins may assign any team */
  assignAny: boolean;
  /** every team slug and name, for the assign choice */
  teams: Array<{ slug: string; name: string }>;
}

/** An owner for one component: the team part of PATCH …/components/{key}, required here. */
const assignSchema = z.object({ team: slugSchema.or(z.literal("")).refine((t) => t !== "", "choose a team") });

/** The teams a viewer may hand a component to: every team for architects and admins, else only those they lead. */
export const ownerChoices = (viewer: OwnerViewer) => (viewer.assignAny ? viewer.teams : viewer.teams.filter((t) => viewer.ledTeams.includes(t.slug)));

export interface Claim {
  env: string;
  key: string;
  team: string;
  teamName: string;
}

/**
 * What was just claimed, with its undo. Held by the screen, not the row: the claimed row leaves an
 * unowned list at once, and the undo must stay.
 */
export function ClaimUndo({ claim, onUndone }: { claim: Claim | null; onUndone: () => void }) {
  const [state, setState] = useState<"idle" | "working" | "failed">("idle");
  if (!claim) return <p role="status" className="sr-only" />;
  return (
    <p role="status" className="flex flex-wrap items-center gap-2 rounded-md border border-ok/50 bg-ok/10 px-3 py-1.5 text-sm" data-testid="claim-done">
      <span>
        <span className="font-mono">{claim.key}</span> now belongs to <span className="font-medium">{claim.teamName}</span>.
      </span>
      <Button
        type="button"
        variant="secondary"
        disabled={state === "working"}
        aria-label={`Undo: make ${claim.key} unowned again`}
        onClick={async () => {
          setState("working");
          // Clearing the owner falls back to the team the inventory file declares: none, for an unowned component.
          const res = await sendJson(annotationResultSchema, `/api/v1/environments/${claim.env}/components/${encodeURIComponent(claim.key)}`, "PATCH", { team: null });
          setState(res.ok ? "idle" : "failed");
          if (res.ok) onUndone();
        }}
      >
        Undo
      </Button>
      {state === "failed" && <span className="text-down">The undo failed; change the owner on the component page.</span>}
    </p>
  );
}

export function ClaimOwner({ env, componentKey, viewer, onClaimed }: { env: string; componentKey: string; viewer: OwnerViewer; onClaimed: (claim: Claim) => void }) {
  const choices = ownerChoices(viewer);
  // Architects pick deliberately (no preselected team to assign by accident); a lead of one team has one choice.
  const form = useApiForm(assignSchema, { team: viewer.assignAny || choices.length > 1 ? "" : (choices[0]?.slug ?? "") });
  if (choices.length === 0) return <span className="text-xs text-muted">a team lead or architect assigns an owner</span>;
  const verb = viewer.assignAny ? "Assign" : "Claim";
  const onSubmit = submitWith(
    form,
    (v) => sendJson(annotationResultSchema, `/api/v1/environments/${env}/components/${encodeURIComponent(componentKey)}`, "PATCH", { team: v.team }),
    (_data, v) => onClaimed({ env, key: componentKey, team: v.team, teamName: viewer.teams.find((t) => t.slug === v.team)?.name ?? v.team }),
  );
  return (
    <ApiForm form={form} onSubmit={onSubmit} label={`${verb} ${componentKey}`} className="flex flex-wrap items-start gap-2">
      {choices.length === 1 && !viewer.assignAny ? (
        <span className="pt-1.5 text-xs text-muted">for {choices[0]?.name}</span>
      ) : (
        <SelectInput
          name="team"
          label={<span className="sr-only">Team for {componentKey}</span>}
          options={[{ value: "", label: "choose a team…" }, ...choices.map((t) => ({ value: t.slug, label: t.name }))]}
          controlClassName="w-auto min-w-40"
        />
      )}
      <SubmitButton working="Saving…" label={`${verb} ${componentKey}`}>
        {verb}
      </SubmitButton>
      <FormProblem className="w-full" />
    </ApiForm>
  );
}
