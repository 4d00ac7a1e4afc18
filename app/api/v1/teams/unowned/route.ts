// GET /api/v1/teams/unowned[?environment=] — components with no owner in any environment, most pinching first (read).
// Claiming and assigning go through PATCH /api/v1/environments/{env}/components/{key}.
import { NextResponse } from "next/server";
import { parseQuery } from "@/lib/api/query";
import { unownedQuerySchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { listUnowned } from "@/lib/data/team-admin";

export const GET = withPermission("read", async ({ req }) => {
  const { environment } = parseQuery(req.url, unownedQuerySchema);
  return NextResponse.json({ items: await listUnowned({ environment }) });
});
