import type { ReactNode } from "react";
import { AdminNav } from "@/components/admin/AdminNav";
import { requireUser } from "@/lib/auth/page";

// No permission check here: each page checks its own (users and tokens need `admin`, the audit
// log also opens to architects), and a layout is not re-run on every client navigation anyway.
export default async function AdminLayout({ children }: { children: ReactNode }) {
  const user = await requireUser();
  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Admin</h1>
        <p className="mt-1 text-sm text-muted">Who may sign in, what they may do, which environments exist, and which tokens CI jobs push with. Every change here is written to the audit log.</p>
      </div>
      <AdminNav role={user.role} />
      {children}
    </div>
  );
}
