// GET /api/v1/environments/{env}/boot-order — cold-start stages; cycles cannot start unaided.
import { NextResponse } from "next/server";
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const served = await getServedAnalysis({ slug: env, withGraph: true });
  const boot = served.view.graph?.bootOrder ?? { stages: [], cycles: [], waitingOnCycle: [] };
  return NextResponse.json({ ...analysisMeta(served), stages: boot.stages, cycles: boot.cycles, waitingOnCycle: boot.waitingOnCycle });
});
