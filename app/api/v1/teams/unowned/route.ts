// GET /api/v1/teams/unowned[?environment=] — components with no owner in any environment, most pinching first (read).
// Claiming and assigning go through PATCH /api/v1/environments/{env}/components/{key}.
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseQuery } from "@/lib/api/query";
import { slugSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { listUnowned } from "@/lib/data/team-admin";

const querySchema = z.object({ environment: slugSchema.optional() }).strict();

export const GET = withPermission("read", async ({ req }) => {
  const { environment } = parseQuery(req.url, querySchema);
  return NextResponse.json({ items: await listUnowned({ environment }) });
});
