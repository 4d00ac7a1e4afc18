// GET /api/v1/environments — every environment with its latest snapshot and analysis status.
import { NextResponse } from "next/server";
import { withPermission } from "@/lib/auth/with-permission";
import { listEnvironments } from "@/lib/data/environments";

export const GET = withPermission(
  "read",
  async ({ actor }) => {
    const items = await listEnvironments();
    // A token bound to one environment sees only that one.
    const bound = actor.type === "token" ? actor.environmentId : null;
    return NextResponse.json({ items: bound ? items.filter((e) => e.id === bound) : items });
  },
  { acrossEnvironments: true },
);
