// What the outbox holds, for admins: counts by status and the messages not (yet) sent.
import "server-only";
import { Op } from "sequelize";
import { db } from "@/models";
import type { OutboxStatus } from "@/models/OutboxMessage";

export interface OutboxOverview {
  counts: Record<OutboxStatus, number>;
  pending: { id: string; to: string[]; subject: string; template: string; status: OutboxStatus; attempts: number; nextAttemptAt: Date; lastError: string | null; createdAt: Date }[];
}

export async function outboxOverview({ limit = 20 }: { limit?: number } = {}): Promise<OutboxOverview> {
  const { OutboxMessage } = db().models;
  const grouped = (await OutboxMessage.count({ group: ["status"] })) as unknown as { status: OutboxStatus; count: number | string }[];
  const counts: Record<OutboxStatus, number> = { queued: 0, sent: 0, failed: 0 };
  for (const g of grouped) counts[g.status] = Number(g.count);
  const rows = await OutboxMessage.findAll({ where: { status: { [Op.ne]: "sent" } }, order: [["createdAt", "DESC"]], limit });
  return {
    counts,
    pending: rows.map((r) => ({ id: r.id, to: r.to, subject: r.subject, template: r.template, status: r.status, attempts: r.attempts, nextAttemptAt: r.nextAttemptAt, lastError: r.lastError, createdAt: r.createdAt })),
  };
}
