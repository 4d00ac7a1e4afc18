// GET /api/v1/schema/inventory — JSON Schema of inventory format 1, generated from the zod schema.
import { NextResponse } from "next/server";
import { withPermission } from "@/lib/auth/with-permission";
import { inventoryJsonSchema } from "@/lib/inventory/schema";

export const GET = withPermission("public", async () =>
  NextResponse.json(inventoryJsonSchema(), { headers: { "content-type": "application/schema+json" } }),
);
