import { EnvironmentsAdmin } from "@/components/admin/EnvironmentsAdmin";
import { requirePagePermission } from "@/lib/auth/page";
import { listEnvironments } from "@/lib/data/environments";

export const metadata = { title: "Admin · Environments" };
// Counts and analysis status change with every push: never serve a cached list.
export const dynamic = "force-dynamic";

export default async function AdminEnvironmentsPage() {
  await requirePagePermission("admin");
  return <EnvironmentsAdmin environments={await listEnvironments()} />;
}
