import { redirect } from "next/navigation";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";

// /admin opens the first admin page this role may use: users for admins, the audit log for architects.
export default async function AdminIndexPage() {
  const user = await requireUser();
  if (roleHas(user.role, "admin")) redirect("/admin/users");
  if (roleHas(user.role, "reviews:write")) redirect("/admin/audit");
  redirect("/forbidden");
}
