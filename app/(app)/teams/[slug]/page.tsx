import { notFound } from "next/navigation";
import { Suspense } from "react";
import { TeamDetail } from "@/components/teams/TeamDetail";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { teamsLedBy } from "@/lib/data/teams";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export const dynamic = "force-dynamic";

export async function generateMetadata({ params }: { params: Promise<{ slug: string }> }) {
  return { title: `Team ${(await params).slug}` };
}

export default async function TeamPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  if (!SLUG_PATTERN.test(slug)) notFound();
  const user = await requireUser();
  const isAdmin = roleHas(user.role, "admin");
  // Mirrors updateTeam: admins, or a lead of this team (whose role can annotate).
  const leads = roleHas(user.role, "components:annotate") && (await teamsLedBy({ userId: user.id })).includes(slug);
  return (
    <Suspense>
      <TeamDetail slug={slug} canEdit={isAdmin || leads} isAdmin={isAdmin} />
    </Suspense>
  );
}
