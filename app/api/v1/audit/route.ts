// GET /api/v1/audit[?action=&actor=&environment=&target=&from=&to=&sort=&order=&limit=&offset=] — the audit log, newest first.
// Rule: whoever may make risk reviews (architects and admins, `reviews:write`) may read the log;
// the same rule guards the /admin/audit page.
import { parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { auditPageSchema, auditQuerySchema } from "@/lib/api/schemas/reviews";
import { withPermission } from "@/lib/auth/with-permission";
import { listAuditEvents } from "@/lib/data/audit-log";

export const GET = withPermission("reviews:write", async ({ req }) => {
  const query = parseQuery(req.url, auditQuerySchema);
  return respond(auditPageSchema, await listAuditEvents(query), { headers: { "cache-control": "no-store" } });
});
