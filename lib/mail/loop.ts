// The mail loop for the worker process: queue review reminders now and then, deliver what is due.
import { deliverOutbox, type DeliverOptions } from "./outbox";
import { noticeReviewsDue } from "./notices";

export interface OutboxLoopOptions extends Omit<DeliverOptions, "now"> {
  /** between delivery turns; default 15 s */
  intervalMs?: number;
  /** between checks for review-by dates; default 10 min, 0 turns the check off */
  reviewCheckMs?: number;
}

/** Start delivering in the background; the returned function stops it after the turn in hand. */
export function startOutboxLoop({ intervalMs = 15_000, reviewCheckMs = 10 * 60_000, ...deliver }: OutboxLoopOptions = {}): () => Promise<void> {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let lastReviewCheck = 0;
  let turn: Promise<void> = Promise.resolve();

  const run = async () => {
    // Both functions log and swallow their own errors; nothing here can reject.
    if (reviewCheckMs > 0 && Date.now() - lastReviewCheck >= reviewCheckMs) {
      lastReviewCheck = Date.now();
      await noticeReviewsDue({ now: new Date() });
    }
    const report = await deliverOutbox(deliver);
    if (report.sent || report.retrying || report.failed) {
      console.log(`[mail] sent ${report.sent}, retrying ${report.retrying}, failed ${report.failed}`);
    }
  };
  const schedule = (delay: number) => {
    if (stopped) return;
    // Turns never overlap: the next is scheduled only when this one has finished.
    timer = setTimeout(() => {
      turn = run()
        .catch((error: unknown) => console.error("[mail] loop turn failed:", error))
        .finally(() => schedule(intervalMs));
    }, delay);
    timer.unref();
  };
  schedule(0);

  return async () => {
    stopped = true;
    if (timer) clearTimeout(timer);
    await turn;
  };
}
