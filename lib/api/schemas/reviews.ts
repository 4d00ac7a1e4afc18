// Requests about risk reviews and pinch-score weights.
import { z } from "zod";
import { REVIEW_STATUSES } from "@/models/RiskReview";
import { booleanParam } from "./common";

const DATE_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

/** A calendar date that exists (2031-02-30 does not), as YYYY-MM-DD. */
export function isCalendarDate(s: string): boolean {
  if (!DATE_PATTERN.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

export const calendarDateSchema = z.string().refine(isCalendarDate, "must be a calendar date written YYYY-MM-DD");

/** Today in UTC as YYYY-MM-DD: the server's notion of "overdue" and of "in the past". */
export const todayUtc = (now = new Date()) => now.toISOString().slice(0, 10);

/** Far enough for a yearly review cycle with slack; further than this is a date nobody will keep. */
export const MAX_REVIEW_HORIZON_DAYS = 731;

export const reviewBodySchema = z
  .object({
    status: z.enum(REVIEW_STATUSES),
    rationale: z.string().trim().min(1, "say why: a review needs a rationale").max(5000),
    reviewBy: calendarDateSchema.nullable().optional(),
  })
  .strict()
  .superRefine((b, ctx) => {
    const reviewBy = b.reviewBy ?? null;
    if (b.status !== "resolved" && reviewBy === null) {
      ctx.addIssue({ code: "custom", path: ["reviewBy"], message: `a risk that is ${b.status} needs a date by which to look at it again` });
      return;
    }
    // A malformed date has its own issue already; comparing it would only add noise.
    if (reviewBy !== null && b.status !== "resolved" && isCalendarDate(reviewBy)) {
      const today = todayUtc();
      if (reviewBy < today) ctx.addIssue({ code: "custom", path: ["reviewBy"], message: "the review-by date is in the past" });
      const horizon = todayUtc(new Date(Date.now() + MAX_REVIEW_HORIZON_DAYS * 86_400_000));
      if (reviewBy > horizon) ctx.addIssue({ code: "custom", path: ["reviewBy"], message: "the review-by date is more than two years away" });
    }
  });
export type ReviewInput = z.infer<typeof reviewBodySchema>;

export const reviewsQuerySchema = z.object({ overdue: booleanParam.optional() }).strict();

export const auditQuerySchema = z
  .object({
    action: z.string().trim().max(64).optional(),
    actor: z.string().trim().max(320).optional(),
    environment: z.string().trim().max(63).optional(),
    target: z.string().trim().max(200).optional(),
    from: calendarDateSchema.optional(),
    to: calendarDateSchema.optional(),
    limit: z.coerce.number().int().min(1).max(200).default(50),
    offset: z.coerce.number().int().min(0).default(0),
  })
  .strict()
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "`from` is after `to`", path: ["from"] });
export type AuditQuery = z.infer<typeof auditQuerySchema>;
