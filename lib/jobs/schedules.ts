// Jobs the queue's scheduler starts (pg-boss cron: each slot runs once across all workers, in the
// time zone PINCHPOINT_SCHEDULE_TZ, UTC by default):
// - review reminders, every hour: reviewers are told when a review-by date has come (once per date,
//   so the hourly run only catches dates as they arrive and anything missed while no worker ran);
// - the weekly risk digest to architects, Monday 07:00.
import { noticeReviewsDue, noticeRiskDigest } from "@/lib/mail";
import { QUEUES, scheduleJob, workQueue } from "@/lib/data/job-queue";

const REVIEW_REMINDERS_CRON = () => process.env.PINCHPOINT_REVIEW_REMINDERS_CRON || "0 * * * *";
const RISK_DIGEST_CRON = () => process.env.PINCHPOINT_RISK_DIGEST_CRON || "0 7 * * 1";
const scheduleTimeZone = () => process.env.PINCHPOINT_SCHEDULE_TZ || "UTC";

/** Register the schedules (idempotent: every worker does it at start) and the handlers of their queues. */
export async function startSchedules(): Promise<void> {
  const tz = scheduleTimeZone();
  await scheduleJob(QUEUES.reviewReminders, REVIEW_REMINDERS_CRON(), tz);
  await scheduleJob(QUEUES.riskDigest, RISK_DIGEST_CRON(), tz);
  await workQueue(QUEUES.reviewReminders, async () => {
    const queued = await noticeReviewsDue({ now: new Date() });
    if (queued) console.log(`[schedule] review reminders: ${queued} queued`);
  });
  await workQueue(QUEUES.riskDigest, async () => {
    const queued = await noticeRiskDigest({ now: new Date() });
    console.log(`[schedule] risk digest: ${queued} queued`);
  });
}
