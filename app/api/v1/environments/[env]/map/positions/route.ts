// GET /api/v1/environments/{env}/map/positions — pinned positions; PUT replaces them (lead+).
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseParams, readJson } from "@/lib/api/query";
import { envParamsSchema, keySchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getPositions, savePositions } from "@/lib/data/map-positions";
import { parseOrThrow } from "@/lib/errors";

const coordinate = z.number().finite().min(-1e7).max(1e7);
const positionsSchema = z.record(keySchema, z.object({ x: coordinate, y: coordinate }).strict()).refine((p) => Object.keys(p).length <= 50_000, { message: "too many positions" });

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return NextResponse.json({ positions: await getPositions({ environmentId: environment.id }) });
});

export const PUT = withPermission<{ env: string }>("components:annotate", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const positions = parseOrThrow(positionsSchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return NextResponse.json({ positions: await savePositions({ environmentId: environment.id, positions, actor }) });
});
