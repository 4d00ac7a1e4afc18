// GET /api/v1/environments — every environment with its latest snapshot and analysis status.
import { NextResponse } from "next/server";
import { withPermission } from "@/lib/auth/with-permission";
import { listEnvironments } from "@/lib/data/environments";

export const GET = withPermission("read", async () => {
  return NextResponse.json({ items: await listEnvironments() });
});
