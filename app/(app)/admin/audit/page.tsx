import { AuditLog } from "@/components/audit/AuditLog";
import { AUDIT_FILTERS, type AuditFilters } from "@/components/audit/filters";
import { requirePagePermission } from "@/lib/auth/page";

export const metadata = { title: "Audit log" };
export const dynamic = "force-dynamic";

// Same rule as GET /api/v1/audit: architects and admins (`reviews:write`).
export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePagePermission("reviews:write");
  const params = await searchParams;
  const initial: AuditFilters = {};
  for (const f of AUDIT_FILTERS) {
    const v = params[f];
    if (typeof v === "string" && v) initial[f] = v;
  }
  const offset = Math.max(0, Number(typeof params.offset === "string" ? params.offset : 0) || 0);
  return <AuditLog initial={initial} initialOffset={offset} />;
}
