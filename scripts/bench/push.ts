// Push benchmark: a 20,000-component inventory in format 1 (YAML), pushed through the same code as
// the API into a throwaway database, then analysed by the same job code as the worker.
import { stringify } from "yaml";
import pg from "pg";
import type { AnalysisInput } from "../../lib/analysis/types";

export function inventoryYaml(input: AnalysisInput, source: string, environment = "bench"): string {
  const needs = new Map<string, Array<string | { key: string; strength: "soft" } | { any_of: string[] }>>();
  const groups = new Map<string, string[]>();
  for (const e of input.edges) {
    const list = needs.get(e.from) ?? [];
    if (e.group) {
      const members = groups.get(e.group) ?? [];
      if (!members.length) list.push({ any_of: members });
      members.push(e.to);
      groups.set(e.group, members);
    } else list.push(e.strength === "soft" ? { key: e.to, strength: "soft" } : e.to);
    needs.set(e.from, list);
  }
  const components = input.nodes.map((n) => ({
    key: n.key,
    kind: "service",
    ...(n.team ? { team: n.team } : {}),
    tier: n.tier,
    replicas: Math.max(1, n.replicas),
    ...(n.zones.length ? { zones: n.zones } : {}),
    ...(needs.get(n.key)?.length ? { needs: needs.get(n.key)?.filter((x) => typeof x !== "object" || !("any_of" in x) || x.any_of.length >= 2) } : {}),
  }));
  return stringify({ pinchpoint: 1, source, environment, components }, { lineWidth: 0 });
}

export async function withBenchDatabase<T>(run: (url: string) => Promise<T>): Promise<T> {
  const admin = process.env.PINCHPOINT_BENCH_ADMIN_URL;
  if (!admin) throw new Error("PINCHPOINT_BENCH_ADMIN_URL is not set: run `npm run bench`, which starts a local PostgreSQL");
  const name = `pp_bench_${process.pid}`;
  const exec = async (sql: string) => {
    const client = new pg.Client({ connectionString: admin });
    await client.connect();
    try {
      await client.query(sql);
    } finally {
      await client.end();
    }
  };
  await exec(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  await exec(`CREATE DATABASE "${name}"`);
  const url = new URL(admin);
  url.pathname = `/${name}`;
  try {
    return await run(url.toString());
  } finally {
    await exec(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  }
}
