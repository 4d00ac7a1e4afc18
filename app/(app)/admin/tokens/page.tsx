import { TokensAdmin } from "@/components/admin/TokensAdmin";
import { requirePagePermission } from "@/lib/auth/page";

export const metadata = { title: "Admin · Tokens" };

export default async function AdminTokensPage() {
  await requirePagePermission("admin");
  return <TokensAdmin />;
}
