import { Suspense } from "react";
import { SWRConfig } from "swr";
import { ComponentList } from "@/components/components/ComponentList";
import { componentsQueryOf, componentsUrl } from "@/components/components/list";
import { parseQuery } from "@/lib/api/query";
import { componentsQuerySchema, componentsResponseSchema, type ComponentsResponse } from "@/lib/api/schemas/components";
import { countComponents, listComponents } from "@/lib/data/components";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { requireUser } from "@/lib/auth/page";
import { ownerViewerFor } from "@/lib/data/teams";

export const metadata = { title: "Components" };

/**
 * The page the screen will ask for first, read here so that its rows come with the HTML instead
 * of after the scripts load and fetch (npm run bench -- --only components-list). What the route
 * answers (app/api/v1/environments/[env]/components/route.ts), through the same JSON the browser
 * would parse; null when the route would refuse, and the screen then asks and shows why.
 */
async function firstPage(env: string, query: URLSearchParams): Promise<ComponentsResponse | null> {
  try {
    const parsed = parseQuery(`http://page.invalid/?${query}`, componentsQuerySchema);
    const environment = await getEnvironmentOrThrow({ slug: env });
    const [page, counts] = await Promise.all([listComponents({ environmentId: environment.id, query: parsed }), countComponents({ environmentId: environment.id })]);
    return componentsResponseSchema.parse(JSON.parse(JSON.stringify({ environment: environment.slug, counts, ...page })));
  } catch {
    return null;
  }
}

export default async function ComponentsPage({ params, searchParams }: { params: Promise<{ env: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const [{ env }, search, user] = await Promise.all([params, searchParams, requireUser()]);
  // Who may claim or assign an owner from the list: the rule annotateComponent applies on the server.
  const viewer = await ownerViewerFor(user);
  const { query } = componentsQueryOf((name) => {
    const v = search[name];
    return typeof v === "string" ? v : null;
  });
  const first = await firstPage(env, query);
  return (
    <Suspense>
      <SWRConfig value={{ fallback: first ? { [componentsUrl(env, query)]: first } : {} }}>
        <ComponentList env={env} viewer={viewer} />
      </SWRConfig>
    </Suspense>
  );
}
