// Owner and notes on a component: leads for their own team's components (and claiming unowned
// ones for their team), architects and admins for any. Audited with before and after.
import "server-only";
import { db } from "@/models";
import { forgetServedState } from "./analysis-results";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { AppError, forbidden, notFound } from "@/lib/errors";
import { lockKey, recordAudit } from "./audit";
import { noticeOwnerAssigned } from "@/lib/mail";
import { teamsLedBy } from "./teams";

export interface AnnotationInput {
  team?: string | null;
  notes?: string | null;
}

export interface AnnotationResult {
  key: string;
  team: string | null;
  declaredTeam: string | null;
  notes: string | null;
}

export async function annotateComponent({
  environmentId,
  key,
  input,
  actor,
}: {
  environmentId: string;
  key: string;
  input: AnnotationInput;
  actor: Actor;
}): Promise<AnnotationResult> {
  if (actor.type !== "user") throw forbidden("Owners and notes are set by people, not tokens");
  const { models, sequelize } = db();
  const component = await models.Component.findOne({ where: { environmentId, key } });
  if (!component) throw notFound(`Component "${key}"`);
  if (input.team) {
    const team = await models.Team.findOne({ where: { slug: input.team } });
    if (!team) throw new AppError("invalid_request", `No team "${input.team}"`, [{ path: "team", message: "no such team" }]);
  }

  return sequelize.transaction(async (transaction) => {
    // Rankings show effective owners: readers see the new one at once.
    transaction.afterCommit(forgetServedState);
    await lockKey({ scope: "annotation", environmentId, key }, transaction);
    const existing = await models.ComponentAnnotation.findOne({ where: { environmentId, key }, transaction, lock: transaction.LOCK.UPDATE });
    const currentOwner = existing?.ownerTeam ?? component.team;
    if (!roleHas(actor.role, "reviews:write")) {
      // A lead: only components their team owns, or unowned ones they claim for a team they lead.
      const led = await teamsLedBy({ userId: actor.id });
      const ownsIt = currentOwner !== null && led.includes(currentOwner);
      const claims = currentOwner === null && input.team !== undefined && input.team !== null && led.includes(input.team);
      if (!ownsIt && !claims) {
        throw forbidden(currentOwner ? `Only a lead of "${currentOwner}", an architect or an admin may change this component` : "Claim an unowned component for a team you lead");
      }
      // A lead hands a component only to a team they lead. Clearing the owner (null) is allowed: the
      // component falls back to the team its inventory file declares, which is the file's word, not theirs.
      if (input.team !== undefined && input.team !== null && !led.includes(input.team)) {
        throw forbidden(`A lead hands components only to teams they lead; "${input.team}" is not one of yours. Ask a lead of "${input.team}", an architect or an admin.`);
      }
    }
    const before = { team: currentOwner, notes: existing?.notes ?? null };
    const ownerTeam = input.team === undefined ? (existing?.ownerTeam ?? null) : input.team;
    const notes = input.notes === undefined ? (existing?.notes ?? null) : input.notes;
    if (existing) await existing.update({ ownerTeam, notes, updatedBy: actor.id }, { transaction });
    else await models.ComponentAnnotation.create({ environmentId, key, ownerTeam, notes, updatedBy: actor.id }, { transaction });
    const after = { team: ownerTeam ?? component.team, notes };
    await recordAudit({ actor, action: "component.annotate", targetType: "component", targetId: key, environmentId, before, after }, transaction);
    // Queued in this transaction: a rolled-back change tells nobody; a failing notice never fails it.
    if (after.team !== before.team) await noticeOwnerAssigned({ environmentId, key, team: after.team, actorLabel: actor.label }, transaction);
    return { key, team: after.team, declaredTeam: component.team, notes };
  });
}
