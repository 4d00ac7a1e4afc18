// GET /api/v1/teams/{slug} — members, contact, components across environments, pinch points (read).
// PATCH — `{ name?, email?, oncall?, description? }`: admins any field, a lead of the team its contact fields; audited.
import { NextResponse } from "next/server";
import { parseParams, readJson } from "@/lib/api/query";
import { teamParamsSchema, updateTeamSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { getTeamDetail, updateTeam } from "@/lib/data/team-admin";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ slug: string }>("read", async ({ params }) => {
  const { slug } = parseParams(params, teamParamsSchema);
  return NextResponse.json(await getTeamDetail({ slug }));
});

// components:annotate lets leads in; which team and which fields is decided in updateTeam.
export const PATCH = withPermission<{ slug: string }>("components:annotate", async ({ req, params, actor }) => {
  const { slug } = parseParams(params, teamParamsSchema);
  const input = parseOrThrow(updateTeamSchema, await readJson(req), "body");
  return NextResponse.json(await updateTeam({ slug, input, actor }));
});
