// Filters of the audit screen, shared by its server page (reading the URL) and the client view.
export const AUDIT_FILTERS = ["action", "actor", "environment", "target", "from", "to"] as const;
export type AuditFilters = Partial<Record<(typeof AUDIT_FILTERS)[number], string>>;
