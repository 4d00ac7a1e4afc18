// When Pinchpoint sends e-mail: one function per trigger. Each reads what it needs (through
// lib/data/notice-data.ts), renders and queues (outbox.ts); none sends, and none lets a mail problem
// fail the caller: errors are logged, and inside a caller's transaction the notice runs in a
// savepoint so its failure rolls back only the notice, never the change it announces.
import { appUrl } from "@/lib/config";
import {
  activeArchitects,
  analysedBaseline,
  componentName,
  environmentNames,
  markReviewsNotified,
  riskDigestSections,
  snapshotNumber,
  takeDueReviews,
  teamContacts,
  topTenByPinch,
} from "@/lib/data/notice-data";
import { withTransaction, type DataTransaction } from "@/lib/data/transactions";
import { enqueueMail } from "./outbox";
import { isoWeek } from "./week";
import type { TopTenEntry } from "./templates";

async function guarded(label: string, transaction: DataTransaction | undefined, work: (t: DataTransaction) => Promise<number>): Promise<number> {
  try {
    // With a parent this is a savepoint; without one, a transaction of its own, so a notice's
    // several messages are queued together or not at all.
    return await withTransaction(transaction, work);
  } catch (error) {
    console.error(`[mail] ${label}: nothing queued:`, error instanceof Error ? error.message : error);
    return 0;
  }
}

/**
 * An owner was assigned: tell the new owner team at its address. `team` null (owner removed)
 * sends nothing. Returns the number of messages queued.
 */
export function noticeOwnerAssigned(
  { environmentId, key, team, actorLabel }: { environmentId: string; key: string; team: string | null; actorLabel: string },
  transaction?: DataTransaction,
): Promise<number> {
  if (!team) return Promise.resolve(0);
  return guarded("owner assigned", transaction, async (t) => {
    const [contact] = await teamContacts({ slugs: [team] }, t);
    if (!contact?.email) {
      console.warn(`[mail] owner assigned: team ${team} has no e-mail address, nobody told`);
      return 0;
    }
    const id = await enqueueMail(
      {
        to: [contact.email],
        template: "ownerAssigned",
        data: {
          environment: await environmentNames({ environmentId }, t),
          component: { key, name: (await componentName({ environmentId, key }, t)) ?? key },
          team: { slug: contact.slug, name: contact.name },
          actorLabel,
        },
      },
      t,
    );
    return id ? 1 : 0;
  });
}

/**
 * After an analysis: components that entered the environment's top ten by pinch score since the
 * previous analysed snapshot. Each owning team gets one message listing its newcomers; each
 * architect gets one listing all of them. The first analysed snapshot of an environment sends
 * nothing (everything would be "new"), and a retried analysis does not send twice.
 */
export function noticeTopTenChanges({ environmentId, snapshotId, previousSnapshotId }: { environmentId: string; snapshotId: string; previousSnapshotId?: string | null }): Promise<number> {
  return guarded("top-ten changes", undefined, async (t) => {
    const number = await snapshotNumber({ environmentId, snapshotId }, t);
    if (number === null) throw new Error(`snapshot ${snapshotId} is not in environment ${environmentId}`);
    const previousId = await analysedBaseline({ environmentId, snapshotNumber: number, previousSnapshotId }, t);
    if (!previousId) return 0;
    const [current, previous] = await Promise.all([topTenByPinch({ environmentId, snapshotId }, t), topTenByPinch({ environmentId, snapshotId: previousId }, t)]);
    const before = new Set(previous.map((e) => e.key));
    const newcomers: TopTenEntry[] = current.filter((e) => !before.has(e.key));
    if (!newcomers.length) return 0;

    const environment = await environmentNames({ environmentId }, t);
    let queued = 0;
    const byTeam = new Map<string, TopTenEntry[]>();
    for (const e of newcomers) if (e.team) byTeam.set(e.team, [...(byTeam.get(e.team) ?? []), e]);
    for (const team of await teamContacts({ slugs: [...byTeam.keys()] }, t)) {
      const entries = byTeam.get(team.slug) ?? [];
      if (!team.email) {
        console.warn(`[mail] top-ten changes: team ${team.slug} has no e-mail address, not told about ${entries.map((e) => e.key).join(", ")}`);
        continue;
      }
      const id = await enqueueMail(
        {
          to: [team.email],
          template: "newTopTen",
          data: { environment, snapshotNumber: number, audience: { kind: "team", teamName: team.name }, entries },
          dedupeKey: `top-ten:${snapshotId}:team:${team.slug}`,
        },
        t,
      );
      if (id) queued++;
    }
    for (const user of await activeArchitects(t)) {
      const id = await enqueueMail(
        {
          to: [user.email],
          template: "newTopTen",
          data: { environment, snapshotNumber: number, audience: { kind: "architects" }, entries: newcomers },
          dedupeKey: `top-ten:${snapshotId}:user:${user.id}`,
        },
        t,
      );
      if (id) queued++;
    }
    return queued;
  });
}

/**
 * Reviews whose review-by date has come (today, UTC, or earlier) and that are not resolved: tell
 * the reviewer once per date. `notified_at` records it; a review whose date moves later is told
 * again when the new date comes (notified_at is then before it). The scheduler runs it every hour.
 */
export function noticeReviewsDue({ now = new Date() }: { now?: Date } = {}): Promise<number> {
  return guarded("reviews due", undefined, async (t) => {
    const today = now.toISOString().slice(0, 10);
    const due = await takeDueReviews({ today }, t);
    let queued = 0;
    for (const r of due) {
      const id = await enqueueMail(
        {
          to: [r.email],
          template: "reviewDue",
          data: {
            environment: r.environment,
            component: { key: r.key, name: r.componentName ?? r.key },
            status: r.status,
            reviewBy: r.reviewBy,
            overdue: r.reviewBy < today,
            rationale: r.rationale,
          },
          dedupeKey: `review-due:${r.id}:${r.reviewBy}`,
        },
        t,
      );
      if (id) queued++;
    }
    await markReviewsNotified({ ids: due.map((r) => r.id), now }, t);
    return queued;
  });
}

/**
 * The weekly risk digest: to every active architect, one message over every environment with
 * something to say (top movers in pinch score, overdue reviews, new single points of failure).
 * Nothing to say anywhere sends nothing; the same week never sends twice.
 */
export async function noticeRiskDigest({ now = new Date() }: { now?: Date } = {}): Promise<number> {
  let sections: Awaited<ReturnType<typeof riskDigestSections>>;
  try {
    sections = (await riskDigestSections({ now })).filter((s) => s.movers.length || s.overdueReviews.length || s.newSinglePoints.length);
  } catch (error) {
    console.error("[mail] risk digest: nothing queued:", error instanceof Error ? error.message : error);
    return 0;
  }
  if (!sections.length) return 0;
  const week = isoWeek(now);
  return guarded("risk digest", undefined, async (t) => {
    let queued = 0;
    for (const user of await activeArchitects(t)) {
      const id = await enqueueMail({ to: [user.email], template: "riskDigest", data: { week, environments: sections }, dedupeKey: `risk-digest:${week}:${user.id}` }, t);
      if (id) queued++;
    }
    return queued;
  });
}

/**
 * An invitation with a one-time link. A relative link ("/invite/…") is made absolute with
 * NEXTAUTH_URL. Pass the transaction that creates the invite so a failed invite sends nothing.
 */
export function noticeInvite(
  { email, link, invitedBy, expiresAt }: { email: string; link: string; invitedBy?: string | null; expiresAt?: Date | null },
  transaction?: DataTransaction,
): Promise<number> {
  return guarded("invite", transaction, async (t) => {
    const absolute = new URL(link, `${appUrl().replace(/\/+$/, "")}/`).toString();
    const id = await enqueueMail({ to: [email], template: "invite", data: { link: absolute, invitedBy: invitedBy ?? null, expiresAt: expiresAt ?? null } }, t);
    return id ? 1 : 0;
  });
}
