// A generated Compose project for the push benchmark: `n` services and 3 needs each, half written
// as depends_on and half only as URLs in environment variables (inferred needs), with a seeded
// choice of targets so every run measures the same file. Targets are earlier services, so the
// graph has no cycles and looks like layered application code.
export function composeProject({ n, seed = 7 }: { n: number; seed?: number }): { text: string; needs: number; inferred: number } {
  let state = seed >>> 0;
  const next = (): number => {
    // Mulberry32: small, seeded, good enough to spread targets.
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const images = ["harbor-pantry/app:1", "postgres:17", "redis:7", "rabbitmq:4", "nginx:1.27"];
  const lines: string[] = ["name: bench-estate", "services:"];
  let needs = 0;
  let inferred = 0;
  // The first few services are the roots everything else can reach.
  const roots = 4;
  for (let i = 0; i < n; i++) {
    lines.push(`  svc-${i}:`, `    image: ${i < roots ? (images[i + 1] ?? images[0]) : images[0]}`);
    if (i === 0) continue;
    const targets = new Set<number>();
    // The first services have fewer earlier ones to need; the last two make up the difference so the
    // project has exactly 3n - 3 + 3 = 3n needs... see the check in scripts/bench.ts.
    const want = Math.min(i, i >= n - 2 ? 6 : 3);
    while (targets.size < want) targets.add(Math.floor(next() * i));
    const list = [...targets];
    // Alternate which half is declared so exactly half of all needs are inferred.
    const declared = list.filter((_, j) => (i + j) % 2 === 0);
    const fromUrls = list.filter((_, j) => (i + j) % 2 === 1);
    if (declared.length > 0) lines.push("    depends_on:", ...declared.map((t) => `      - svc-${t}`));
    lines.push("    environment:", ...fromUrls.map((t, j) => `      UPSTREAM_${j}_URL: http://svc-${t}:8080/api/v1`), "      LOG_LEVEL: info");
    needs += list.length;
    inferred += fromUrls.length;
  }
  return { text: `${lines.join("\n")}\n`, needs, inferred };
}
