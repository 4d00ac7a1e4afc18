import { Suspense } from "react";
import { AuditLog } from "@/components/audit/AuditLog";
import { requirePagePermission } from "@/lib/auth/page";

export const metadata = { title: "Audit log" };
export const dynamic = "force-dynamic";

// Same rule as GET /api/v1/audit: architects and admins (`reviews:write`). Filters and page are in
// the URL, read by the screen.
export default async function AuditPage() {
  await requirePagePermission("reviews:write");
  return (
    <Suspense>
      <AuditLog />
    </Suspense>
  );
}
