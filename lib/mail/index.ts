// E-mail: queue with enqueueMail or a notice; lib/jobs/mail.ts delivers from the worker.
export { enqueueMail } from "./outbox";
export { noticeOwnerAssigned, noticeTopTenChanges, noticeReviewsDue, noticeInvite, noticeRiskDigest } from "./notices";
