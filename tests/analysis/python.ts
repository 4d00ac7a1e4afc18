// Runs one of the reference scripts in tests/analysis/reference/ with Debian's python3 (networkx,
// scipy, igraph) on a JSON batch, and returns its JSON answer. One process per batch keeps the
// suite fast.
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

// Debian's interpreter, not whatever `python3` is first on PATH (a pyenv one may carry a pip
// networkx of another version).
export const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";

export function runReference<T>(script: string, batch: unknown): T {
  try {
    execFileSync(PYTHON, ["-c", "import networkx, scipy"], { encoding: "utf8" });
  } catch {
    throw new Error(
      `Debian's python3-networkx is required for these reference checks but ${PYTHON} cannot import networkx/scipy. ` +
        "Install it with: apt-get install -y python3-networkx python3-scipy python3-igraph",
    );
  }
  const dir = mkdtempSync(join(tmpdir(), "pinchpoint-nx-"));
  try {
    const file = join(dir, "batch.json");
    writeFileSync(file, JSON.stringify(batch));
    const out = execFileSync(PYTHON, [join(__dirname, "reference", script), file], { encoding: "utf8", maxBuffer: 512 * 1024 * 1024 });
    return JSON.parse(out) as T;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
