import { UsersAdmin } from "@/components/admin/UsersAdmin";
import { requirePagePermission } from "@/lib/auth/page";

export const metadata = { title: "Admin · Users" };

export default async function AdminUsersPage() {
  const admin = await requirePagePermission("admin");
  return <UsersAdmin currentUserId={admin.id} />;
}
