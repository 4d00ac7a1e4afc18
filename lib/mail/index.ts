// E-mail: queue with enqueueMail or a notice; lib/jobs/mail.ts delivers from the worker.
export { noticeOwnerAssigned, noticeTopTenChanges, noticeReviewsDue, noticeInvite, noticeRiskDigest } from "./notices";
