import { Suspense } from "react";
import { OverduePanel } from "@/components/reviews/OverduePanel";
import { TeamsList } from "@/components/teams/TeamsList";
import { UnownedQueue } from "@/components/teams/UnownedQueue";
import { requireUser } from "@/lib/auth/page";
import { roleHas } from "@/lib/auth/roles";
import { listOverdueReviews } from "@/lib/data/reviews";
import { defaultEnvironment } from "@/lib/config";
import { listEnvironments } from "@/lib/data/environments";
import { listTeams, teamsLedBy } from "@/lib/data/teams";

export const metadata = { title: "Teams" };
export const dynamic = "force-dynamic";

export default async function TeamsPage() {
  const user = await requireUser();
  const [teams, ledTeams, overdue, environments] = await Promise.all([listTeams(), teamsLedBy({ userId: user.id }), listOverdueReviews(), listEnvironments()]);
  // The same rule annotateComponent applies on the server: leads claim for their teams, architects and admins assign any.
  const assignAny = roleHas(user.role, "reviews:write");
  const mayClaim = roleHas(user.role, "components:annotate");
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Teams and owners</h1>
        <p className="mt-1 text-sm text-muted">Who owns what, who to page, and what nobody owns yet.</p>
      </div>
      <TeamsList isAdmin={roleHas(user.role, "admin")} />
      <div className="grid gap-6 xl:grid-cols-3">
        <div className="xl:col-span-2">
          <Suspense>
            <UnownedQueue
              defaultEnvironment={defaultEnvironment()}
              environments={environments.map((e) => e.slug)}
              viewer={{
                ledTeams: mayClaim ? ledTeams : [],
                assignAny,
                teams: teams.map((t) => ({ slug: t.slug, name: t.name })),
              }}
            />
          </Suspense>
        </div>
        <OverduePanel items={overdue} />
      </div>
    </div>
  );
}
