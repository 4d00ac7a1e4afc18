// Risk reviews, pinch-score weights and the audit log: requests and answers.
import { z } from "zod";
import { pinchWeightsSchema } from "@/lib/analysis/types";
import { REVIEW_STATUSES } from "@/lib/review-status";
import { booleanParam, defineList, instantSchema, listQuery, pageOf } from "./common";

const DATE_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

/** A calendar date that exists (2031-02-30 does not), as YYYY-MM-DD. */
function isCalendarDate(s: string): boolean {
  if (!DATE_PATTERN.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

const calendarDateSchema = z.string().refine(isCalendarDate, "must be a calendar date written YYYY-MM-DD");

/** Today in UTC as YYYY-MM-DD: the server's notion of "overdue" and of "in the past". */
export const todayUtc = (now = new Date()) => now.toISOString().slice(0, 10);

/** Far enough for a yearly review cycle with slack; further than this is a date nobody will keep. */
const MAX_REVIEW_HORIZON_DAYS = 731;

/** The fields of a review; reviewBodySchema adds the rules about dates. */
export const reviewFieldsSchema = z.object({
  status: z.enum(REVIEW_STATUSES),
  rationale: z.string().trim().min(1, "say why: a review needs a rationale").max(5000),
  reviewBy: calendarDateSchema.nullable().optional(),
});

/** A review-by date is needed until the risk is resolved, and it lies within the next two years. */
export function checkReviewDates(b: { status: (typeof REVIEW_STATUSES)[number]; reviewBy?: string | null }, ctx: z.RefinementCtx): void {
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
}

export const reviewBodySchema = reviewFieldsSchema.strict().superRefine(checkReviewDates);
export type ReviewInput = z.infer<typeof reviewBodySchema>;

export const reviewsQuerySchema = z.object({ overdue: booleanParam.optional() }).strict();

export const AUDIT_LIST = defineList({
  sorts: { at: "desc", action: "asc", actor: "asc" },
  defaultSort: "at",
  defaultLimit: 50,
  maxLimit: 200,
});

/** The audit log's filters, shared by its page (reading the URL) and the route. */
export const auditFiltersSchema = z.object({
  action: z.string().trim().max(64).optional(),
  actor: z.string().trim().max(320).optional(),
  environment: z.string().trim().max(63).optional(),
  target: z.string().trim().max(200).optional(),
  from: calendarDateSchema.optional(),
  to: calendarDateSchema.optional(),
});
export const AUDIT_FILTERS = Object.keys(auditFiltersSchema.shape) as Array<keyof typeof auditFiltersSchema.shape>;

export const auditQuerySchema = listQuery(AUDIT_LIST)
  .extend(auditFiltersSchema.shape)
  .strict()
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "`from` is after `to`", path: ["from"] });
export type AuditQuery = z.infer<typeof auditQuerySchema>;

// ---------------------------------------------------------------------------------------------
// Responses

const reviewSummarySchema = z.object({ status: z.enum(REVIEW_STATUSES), reviewBy: z.string().nullable(), overdue: z.boolean() });
export type ReviewSummary = z.infer<typeof reviewSummarySchema>;

export const reviewViewSchema = reviewSummarySchema.extend({
  environment: z.string(),
  key: z.string(),
  /** the component's display name; null when it is no longer declared */
  name: z.string().nullable(),
  rationale: z.string(),
  reviewer: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(),
  notifiedAt: instantSchema.nullable(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
});
export type ReviewView = z.infer<typeof reviewViewSchema>;

/** GET …/reviews. */
export const reviewsResponseSchema = z.object({ environment: z.string(), items: z.array(reviewViewSchema) });

/** DELETE …/reviews/{key}. */
export const clearedReviewSchema = z.object({ cleared: z.literal(true) });

/** GET and PUT …/weights. */
export const weightsViewSchema = z.object({
  weights: pinchWeightsSchema,
  /** false while the environment uses the defaults of DESIGN §3 */
  custom: z.boolean(),
  defaults: pinchWeightsSchema,
  requeued: z.object({ snapshot: z.int() }).nullable().optional(),
});
export type WeightsView = z.infer<typeof weightsViewSchema>;

const auditEntrySchema = z.object({
  id: z.string(),
  at: instantSchema,
  actorType: z.enum(["user", "token", "system"]),
  actorLabel: z.string(),
  action: z.string(),
  targetType: z.string(),
  targetId: z.string(),
  environment: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

/** GET /audit: a page of events, newest first, and every action recorded (the filter's choices). */
export const auditPageSchema = pageOf(auditEntrySchema).extend({ actions: z.array(z.string()) });
export type AuditPage = z.infer<typeof auditPageSchema>;
