// GET /api/v1/openapi.json — OpenAPI 3.1, generated from the zod schemas the handlers use.
import { NextResponse } from "next/server";
import { openApiDocument } from "@/lib/api/openapi";
import { withPermission } from "@/lib/auth/with-permission";
import { appUrl } from "@/lib/config";

export const GET = withPermission("public", async () => NextResponse.json(openApiDocument(appUrl())));
