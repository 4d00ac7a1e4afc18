import { Suspense } from "react";
import { ReviewsScreen } from "@/components/reviews/ReviewsScreen";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { listTeams, teamsLedBy } from "@/lib/data/teams";

export const dynamic = "force-dynamic";

export async function generateMetadata({ params }: { params: Promise<{ env: string }> }) {
  return { title: `Risk reviews · ${(await params).env}` };
}

export default async function ReviewsPage({ params }: { params: Promise<{ env: string }> }) {
  const [{ env }, user] = await Promise.all([params, requireUser()]);
  const [teams, ledTeams] = await Promise.all([listTeams(), teamsLedBy({ userId: user.id })]);
  const canWrite = roleHas(user.role, "reviews:write");
  return (
    <Suspense>
      <ReviewsScreen
        env={env}
        canWrite={canWrite}
        canReadAudit={canWrite}
        queueViewer={{
          ledTeams: roleHas(user.role, "components:annotate") ? ledTeams : [],
          assignAny: canWrite,
          teams: teams.map((t) => ({ slug: t.slug, name: t.name })),
        }}
      />
    </Suspense>
  );
}
