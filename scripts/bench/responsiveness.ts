// Does a bad 20 MB push hold up the rest of the process? The push route and a GET route are called
// in this one process, as the server would run them: while the push is parsed, a GET is due every
// 50 ms, and each GET's latency counts from when it was due (a blocked event loop delays the start,
// which is exactly what a waiting user feels). Parsed on worker threads (importers/off-thread.ts)
// and, for comparison, on the request thread as before (PINCHPOINT_PARSE_THREADS=0).
import { NextRequest } from "next/server";
import { MAX_BODY_BYTES } from "../../lib/inventory/limits";

// Route handlers as the bench calls them (each declares its own params; these are the ones it passes).
type Handler = (req: NextRequest, ctx: { params: Promise<never> }) => Promise<Response>;

const pad = (n: number) => String(n).padStart(6, "0");

/** Components (each about 250 bytes) filling `room` bytes; `extra` goes into each one. */
function rows(room: number, extra = ""): string[] {
  const out: string[] = [];
  let size = 0;
  for (let i = 0; size < room; i++) {
    const row = `  - key: c${pad(i)}\n    kind: service\n${extra}    name: "Component ${i} ${"x".repeat(160)}"\n    needs: [c${pad(Math.max(0, i - 1))}]\n`;
    out.push(row);
    size += row.length;
  }
  return out;
}

/** Three bad files just under the 20 MiB body limit, each bad in its own way. */
export function badYamlFiles(): Array<{ name: string; body: string }> {
  const room = MAX_BODY_BYTES - 64 * 1024;
  const head = "pinchpoint: 1\nsource: bench-bad\ncomponents:\n";
  // Valid all the way to the last line.
  const syntax = head + rows(room).join("") + "  - key: [unclosed\n";
  // One anchor, aliased by every component: the file goes down the located parser (yaml), and the
  // aliases expand past the cap.
  const anchors = head + "  - key: anchor\n    kind: service\n    tags: &tags [shared]\n" + rows(room, "    tags: *tags\n").join("");
  const many = head + Array.from({ length: 60_000 }, (_, i) => `  - {key: m${pad(i)}, kind: service, name: "Component ${i} ${"x".repeat(200)}"}\n`).join("");
  return [
    { name: "syntax error on the last line", body: syntax },
    { name: "an anchor aliased by every component", body: anchors },
    { name: "60,000 components (over the limit)", body: many },
  ];
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

export async function measureWhilePushing({ push, get, token, body }: { push: Handler; get: Handler; token: string; body: string }) {
  const headers = { authorization: `Bearer ${token}` };
  const latencies: number[] = [];
  const started = performance.now();
  let doneAt = Infinity;
  const pushing = push(
    new NextRequest("http://127.0.0.1:3000/api/v1/environments/bench/inventory", { method: "POST", headers: { ...headers, "content-type": "application/yaml" }, body }),
    { params: Promise.resolve({ env: "bench" } as never) },
  ).then(async (res) => {
    const status = res.status;
    await res.text();
    doneAt = performance.now();
    return { status, ms: doneAt - started };
  });
  const reads = (async () => {
    // Every GET that fell due while the push was in hand is sent, late if the loop was blocked.
    for (let k = 1; ; k++) {
      const due = started + k * 50;
      if (due > doneAt) break;
      const wait = due - performance.now();
      if (wait > 0) await new Promise((r) => setTimeout(r, wait));
      if (due > doneAt) break;
      const res = await get(new NextRequest("http://127.0.0.1:3000/api/health"), { params: Promise.resolve({} as never) });
      await res.text();
      latencies.push(performance.now() - due);
    }
  })();
  const result = await pushing;
  await reads;
  const sorted = [...latencies].sort((a, b) => a - b);
  return { push: result, gets: sorted.length, p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted[sorted.length - 1] ?? NaN };
}
