// E-mail: queue with enqueueMail or a notice, deliver from the worker with startOutboxLoop.
export { enqueueMail, deliverOutbox, MAX_ATTEMPTS, BACKOFF_MS, type DeliveryReport, type DeliverOptions } from "./outbox";
export { noticeOwnerAssigned, noticeTopTenChanges, noticeReviewsDue, noticeInvite } from "./notices";
export { startOutboxLoop, type OutboxLoopOptions } from "./loop";
