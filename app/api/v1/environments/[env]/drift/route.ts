// GET /api/v1/environments/{env}/drift — observed (traces) against declared edges: seen but never declared, declared but never seen.
import { NextResponse } from "next/server";
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getDrift } from "@/lib/data/drift";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return NextResponse.json(await getDrift({ environmentId: environment.id }));
});
