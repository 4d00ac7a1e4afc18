"use client";
// The environment in every URL, switchable from every page: the same screen in the chosen environment.
import { usePathname, useRouter } from "next/navigation";
import { environmentsResponseSchema } from "@/lib/api/schemas/environments";
import { useApi } from "@/lib/client/api";
import { isScratchEnvironment } from "./nav";

/** The current path with its environment replaced; screens outside an environment open its overview. */
export function pathInEnvironment(path: string, from: string, to: string): string {
  const prefix = `/environments/${from}`;
  if (path === prefix || path.startsWith(`${prefix}/`)) {
    // A component or incident of one environment need not exist in another: go to its list.
    const rest = path.slice(prefix.length).replace(/^\/(components|incidents)\/.+$/, "/$1");
    return `/environments/${to}${rest}`;
  }
  return `/environments/${to}`;
}

export function EnvironmentSwitcher({ env }: { env: string }) {
  const router = useRouter();
  const path = usePathname();
  const list = useApi(environmentsResponseSchema, "/api/v1/environments", { revalidateOnFocus: false });
  const items = list.data?.items ?? [];
  const main = items.filter((e) => !isScratchEnvironment(e.slug));
  const scratch = items.filter((e) => isScratchEnvironment(e.slug));
  const known = items.some((e) => e.slug === env);
  return (
    // "Env", not "Environment": the screens' own environment filters keep that word to themselves.
    <label className="flex items-center gap-1.5 text-xs text-muted" title="The environment every screen shows">
      <span>Env</span>
      <select
        value={env}
        onChange={(e) => router.push(pathInEnvironment(path, env, e.target.value))}
        className="max-w-40 rounded border border-line bg-canvas px-1.5 py-1 font-mono text-xs text-ink focus:border-brass"
        data-testid="environment-switcher"
      >
        {!known && <option value={env}>{env}</option>}
        {main.length > 0 && (
          <optgroup label="Environments">
            {main.map((e) => (
              <option key={e.slug} value={e.slug}>
                {e.slug}
              </option>
            ))}
          </optgroup>
        )}
        {scratch.length > 0 && (
          <optgroup label="Test and scratch">
            {scratch.map((e) => (
              <option key={e.slug} value={e.slug}>
                {e.slug}
              </option>
            ))}
          </optgroup>
        )}
      </select>
    </label>
  );
}
