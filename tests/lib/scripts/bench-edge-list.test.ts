// `npm run bench -- --edge-list FILE` measures a given edge list in memory: it must run with no
// PostgreSQL at all (no DATABASE_URL, no cluster started) and print its one JSON line.
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(__dirname, "../../..");

describe("npm run bench -- --edge-list", () => {
  it("needs no database", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "pp-edges-"));
    try {
      const file = path.join(dir, "edges.txt");
      writeFileSync(file, "# a path of three\na b\nb c\n");
      const env: NodeJS.ProcessEnv = { ...process.env, PINCHPOINT_PG_NAME: "pg-bench-must-not-start", DATABASE_URL: "" };
      delete env.PINCHPOINT_BENCH_ADMIN_URL;
      const out = execFileSync("bash", ["scripts/bench.sh", "--edge-list", file], { cwd: root, env, encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] });
      const line = JSON.parse(out.trim().split("\n").pop()!) as { nodes: number; edges: number };
      expect(line).toMatchObject({ nodes: 3, edges: 2 });
      expect(existsSync(path.join(root, ".data/pg-bench-must-not-start"))).toBe(false);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
