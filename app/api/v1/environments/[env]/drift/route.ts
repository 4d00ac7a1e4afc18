// GET /api/v1/environments/{env}/drift[?seen_limit=&seen_offset=&seen_sort=&seen_order=&seen_q=&declared_…] —
// traced calls against declared needs: seen but never declared, declared but never seen, each list
// one page of it. Drift is worked out from the current graph and the trace window, then paged.
import { pageInMemory } from "@/lib/api/list-page";
import { parseParams, parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { envParamsSchema, orderOf } from "@/lib/api/schemas/common";
import { DRIFT_DECLARED_LIST, DRIFT_SEEN_LIST, driftQuerySchema, driftResponseSchema } from "@/lib/api/schemas/drift";
import { withPermission } from "@/lib/auth/with-permission";
import { getDrift } from "@/lib/data/drift";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const q = parseQuery(req.url, driftQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  const drift = await getDrift({ environmentId: environment.id });
  const seen = { sort: q.seen_sort, order: orderOf(DRIFT_SEEN_LIST, { sort: q.seen_sort, order: q.seen_order }), limit: q.seen_limit, offset: q.seen_offset, q: q.seen_q };
  const declared = { sort: q.declared_sort, order: orderOf(DRIFT_DECLARED_LIST, { sort: q.declared_sort, order: q.declared_order }), limit: q.declared_limit, offset: q.declared_offset, q: q.declared_q };
  return respond(driftResponseSchema, {
    ...drift,
    seenNotDeclared: pageInMemory(drift.seenNotDeclared, seen, { value: (r, s) => r[s], text: (r) => `${r.from} ${r.to} ${r.tracedAs.join(" ")} ${r.evidence.join(" ")}` }),
    declaredNotSeen: pageInMemory(drift.declaredNotSeen, declared, { value: (r, s) => r[s], text: (r) => `${r.from} ${r.to} ${r.source} ${r.team ?? ""}` }),
  });
});
