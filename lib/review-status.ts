// What an architect can decide about a pinch point (DESIGN §1, risk review): one list for the
// table's enum, the API's schemas and the screens.
export const REVIEW_STATUSES = ["accepted", "mitigating", "resolved"] as const;
export type ReviewStatus = (typeof REVIEW_STATUSES)[number];
