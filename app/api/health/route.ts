// GET /api/health — app, database, analysis worker heartbeat and queue depth, without a sign-in:
// for load balancers, `npm start`'s own readiness check and the overview. 503 with Retry-After
// while the database is unreachable; 200 otherwise, `degraded` when no worker has been seen.
import { respond } from "@/lib/api/respond";
import { healthResponseSchema } from "@/lib/api/schemas/health";
import { withPermission } from "@/lib/auth/with-permission";
import { healthReport } from "@/lib/data/health";
import { DATABASE_RETRY_AFTER_S } from "@/lib/errors";

export const dynamic = "force-dynamic";

export const GET = withPermission("public", async () => {
  const report = await healthReport();
  const unavailable = report.status === "unavailable";
  return respond(healthResponseSchema, report, {
    status: unavailable ? 503 : 200,
    headers: { "cache-control": "no-store", ...(unavailable ? { "retry-after": String(DATABASE_RETRY_AFTER_S) } : {}) },
  });
});
