// Trace benchmark (npm run bench -- --only traces): the receiver and the trace-file path, each
// through its real route handler behind a node:http server on 127.0.0.1, into a throwaway database.
//   1. 1,000,000 spans through the receiver in batches (binary protobuf, the Collector's default
//      encoding; four requests in flight, as an exporter's sending queue keeps several);
//   2. the same number of spans as one JSON Lines file, streamed to ?format=otlp;
//   3. a steady 5,000 spans a second for 20 s (5 requests of 1,000 spans a second), timing each.
// The workload: an estate of 60 services, each calling 3 others and one of 20 datastores (about 240
// edges); each trace is a service handling a request (SERVER), calling another (CLIENT → SERVER),
// which queries its datastore. Batches are cut every N spans wherever that falls, so some calls
// have their halves in different requests, as with a real Collector.
import { once } from "node:events";
import { createReadStream, createWriteStream, rmSync, statSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { ExportTraceServiceRequest } from "../../importers/otlp/proto";
import { mulberry32 } from "../../lib/analysis/random";

const SERVICES = 60;
const DATASTORES = 20;


interface GenSpan {
  service: string;
  traceId: Buffer;
  spanId: Buffer;
  parentSpanId: Buffer;
  kind: number;
  start: bigint;
  end: bigint;
  attributes: Array<{ key: string; value: { stringValue: string } }>;
  error: boolean;
}

/** `count` spans, four per trace, in trace order. */
function* workload(count: number, seed: number): Generator<GenSpan> {
  const rnd = mulberry32(seed);
  const id = (n: number) => {
    const b = Buffer.alloc(n);
    for (let i = 0; i < n; i += 4) b.writeUInt32BE(Math.floor(rnd() * 4294967296) >>> 0, i);
    return b;
  };
  // The estate: fixed callees and a datastore per service, from a seed of its own.
  const shape = mulberry32(42);
  const callees = Array.from({ length: SERVICES }, (_, s) => [1, 2, 3].map((k) => (s + k + Math.floor(shape() * (SERVICES - 4))) % SERVICES));
  const stores = Array.from({ length: SERVICES }, () => Math.floor(shape() * DATASTORES));
  const t0 = BigInt(Date.now()) * 1_000_000n;
  for (let i = 0; i < count; i += 4) {
    const from = Math.floor(rnd() * SERVICES);
    const to = callees[from]![Math.floor(rnd() * 3)]!;
    const caller = `svc-${from}`;
    const callee = `svc-${to}`;
    const store = `db-${stores[to]}`;
    const trace = id(16);
    const [root, call, served, query] = [id(8), id(8), id(8), id(8)];
    const start = t0 + BigInt(i) * 1000n;
    const ms = (x: number) => BigInt(Math.round(x * 1e6));
    const d = 2 + rnd() * 40;
    const err = rnd() < 0.01;
    yield { service: caller, traceId: trace, spanId: root, parentSpanId: Buffer.alloc(0), kind: 2, start, end: start + ms(d + 4), attributes: [{ key: "http.route", value: { stringValue: "/orders" } }], error: false };
    yield { service: caller, traceId: trace, spanId: call, parentSpanId: root, kind: 3, start: start + ms(1), end: start + ms(d + 2), attributes: [{ key: "http.request.method", value: { stringValue: "GET" } }, { key: "server.address", value: { stringValue: `${callee}.internal` } }], error: err };
    yield { service: callee, traceId: trace, spanId: served, parentSpanId: call, kind: 2, start: start + ms(1.5), end: start + ms(d + 1.5), attributes: [{ key: "http.request.method", value: { stringValue: "GET" } }], error: err };
    yield { service: callee, traceId: trace, spanId: query, parentSpanId: served, kind: 3, start: start + ms(2), end: start + ms(2 + d / 4), attributes: [{ key: "db.system.name", value: { stringValue: "postgresql" } }, { key: "server.address", value: { stringValue: store } }], error: false };
  }
}

function* batches(count: number, size: number, seed: number): Generator<GenSpan[]> {
  let batch: GenSpan[] = [];
  for (const s of workload(count, seed)) {
    batch.push(s);
    if (batch.length === size) {
      yield batch;
      batch = [];
    }
  }
  if (batch.length) yield batch;
}

function request(spans: GenSpan[]) {
  const byService = new Map<string, GenSpan[]>();
  for (const s of spans) byService.set(s.service, [...(byService.get(s.service) ?? []), s]);
  return {
    resourceSpans: [...byService].map(([service, list]) => ({
      resource: { attributes: [{ key: "service.name", value: { stringValue: service } }] },
      scopeSpans: [
        {
          spans: list.map((s) => ({
            traceId: s.traceId,
            spanId: s.spanId,
            parentSpanId: s.parentSpanId,
            name: "op",
            kind: s.kind,
            startTimeUnixNano: s.start.toString(),
            endTimeUnixNano: s.end.toString(),
            attributes: s.attributes,
            status: { code: s.error ? 2 : 0 },
          })),
        },
      ],
    })),
  };
}

const protobuf = (spans: GenSpan[]): Buffer => Buffer.from(ExportTraceServiceRequest.encode(ExportTraceServiceRequest.fromObject(request(spans))).finish());

function jsonLine(spans: GenSpan[]): string {
  return JSON.stringify(request(spans), (_k, v: unknown) => (Buffer.isBuffer(v) ? v.toString("hex") : v && typeof v === "object" && (v as { type?: string }).type === "Buffer" ? Buffer.from((v as { data: number[] }).data).toString("hex") : v));
}

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** A node:http server in front of route handlers, as `next start` puts them behind its own. */
async function serve(routes: Array<{ pattern: RegExp; handler: Handler }>): Promise<{ url: string; close: () => Promise<void> }> {
  const { NextRequest } = await import("next/server");
  const server = createServer((req: IncomingMessage, res: ServerResponse) => {
    void (async () => {
      const url = new URL(req.url ?? "/", "http://127.0.0.1");
      const route = routes.find((r) => r.pattern.test(url.pathname));
      if (!route) {
        res.writeHead(404).end();
        return;
      }
      const env = route.pattern.exec(url.pathname)?.[1] ?? "";
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
      const body = Readable.toWeb(req) as ReadableStream<Uint8Array>;
      const init = { method: req.method, headers, body, duplex: "half" };
      const nreq = new NextRequest(url, init as unknown as ConstructorParameters<typeof NextRequest>[1]);
      const answer = await route.handler(nreq, { params: Promise.resolve({ env }) });
      res.writeHead(answer.status, Object.fromEntries(answer.headers));
      res.end(Buffer.from(await answer.arrayBuffer()));
    })().catch((error: unknown) => {
      console.error("[bench server]", error);
      if (!res.headersSent) res.writeHead(500);
      res.end();
    });
  });
  // Clients keep connections open between requests; a server closing an idle one while a request is
  // on its way makes a reset, so idle connections are kept longer than any pause in the benchmark.
  server.keepAliveTimeout = 120_000;
  server.listen(0, "127.0.0.1");
  await once(server, "listening");
  const address = server.address();
  if (!address || typeof address === "string") throw new Error("no address");
  return { url: `http://127.0.0.1:${address.port}`, close: () => new Promise((r) => server.close(() => r())) };
}

const pct = (sorted: number[], q: number): number => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))] ?? NaN;

export async function benchTraces(databaseUrl: string): Promise<void> {
  process.env.DATABASE_URL = databaseUrl;
  process.env.NEXTAUTH_SECRET ??= "bench-secret";
  const { db, closeDb } = await import("../../models");
  const { migrateToLatest } = await import("../../models/migrate");
  const { createToken } = await import("../../lib/data/tokens");
  const receiver = (await import("../../app/api/v1/environments/[env]/otlp/v1/traces/route")).POST as unknown as Handler;
  const inventory = (await import("../../app/api/v1/environments/[env]/inventory/route")).POST as unknown as Handler;
  const { sweepWaitingCalls } = await import("../../lib/data/traces");
  const { materialiseObservedGraph } = await import("../../lib/data/observed-graph");
  await migrateToLatest(db().sequelize);
  // A new pool: Sequelize reads the enum types (token scopes) when a connection opens, and the
  // migration created them after this one opened.
  await closeDb();
  const admin = await db().models.User.create({ email: "bench@bench.example", name: "bench", role: "admin", passwordHash: null, oidcSubject: null });
  const { token } = await createToken({ name: "bench", scopes: ["inventory:write"], environmentId: null, source: null, createdBy: admin.id });
  const server = await serve([
    { pattern: /^\/api\/v1\/environments\/([a-z0-9-]+)\/otlp\/v1\/traces$/, handler: receiver },
    { pattern: /^\/api\/v1\/environments\/([a-z0-9-]+)\/inventory$/, handler: inventory },
  ]);
  const auth = { authorization: `Bearer ${token}` };
  const TOTAL = 1_000_000;
  const BATCH = 5_000;
  try {
    // 0. Decoding and folding alone, in this process: the CPU a span costs before any I/O.
    {
      const { spansFromProtobuf, spansFromJson } = await import("../../importers/otlp/spans");
      const { TraceFold } = await import("../../lib/traces/fold");
      const pbBodies = [...batches(200_000, BATCH, 9)].map(protobuf);
      const jsBodies = [...batches(200_000, BATCH, 9)].map((b) => Buffer.from(jsonLine(b)));
      for (const [label, bodies, decode] of [
        ["protobuf", pbBodies, (b: Buffer) => spansFromProtobuf(b)],
        ["JSON", jsBodies, (b: Buffer) => spansFromJson(JSON.parse(b.toString("utf8")))],
      ] as const) {
        const fold = new TraceFold();
        const c0 = process.cpuUsage();
        const w0 = performance.now();
        for (const body of bodies) {
          const d = decode(body);
          if (d.ok) fold.add(d.spans);
        }
        const cpu = process.cpuUsage(c0);
        console.log(`decode + fold in process, ${label}: ${((cpu.user + cpu.system) / 200_000).toFixed(2)} µs CPU a span (${(performance.now() - w0).toFixed(0)} ms wall for 200,000 spans; ${fold.stats.calls.toLocaleString()} calls)`);
      }
    }

    // Warm-up: creates the environment and compiles the hot paths.
    for (const b of batches(20_000, BATCH, 1)) await post(`${server.url}/api/v1/environments/bench-warm/otlp/v1/traces`, protobuf(b), { ...auth, "content-type": "application/x-protobuf" });

    // 1. A million spans through the receiver. Encoding happens before the clock starts.
    const bodies = [...batches(TOTAL, BATCH, 2)].map(protobuf);
    const latencies: number[] = [];
    const c1 = process.cpuUsage();
    const t0 = performance.now();
    let next = 0;
    await Promise.all(
      Array.from({ length: 4 }, async () => {
        while (next < bodies.length) {
          const body = bodies[next++]!;
          const s = performance.now();
          const res = await post(`${server.url}/api/v1/environments/bench-recv/otlp/v1/traces`, body, { ...auth, "content-type": "application/x-protobuf" });
          latencies.push(performance.now() - s);
          if (res.status !== 200) throw new Error(`receiver answered ${res.status}: ${res.text}`);
        }
      }),
    );
    const took = performance.now() - t0;
    const recvCpu = process.cpuUsage(c1);
    latencies.sort((a, b) => a - b);
    const env = await db().models.Environment.findOne({ where: { slug: "bench-recv" } });
    const swept = await sweepWaitingCalls({ graceSeconds: 0 });
    const calls = await db().sequelize.query<{ calls: string; edges: string }>(
      "SELECT sum(b.calls) AS calls, count(DISTINCT e.id) AS edges FROM trace_edges e JOIN trace_edge_buckets b ON b.edge_id = e.id WHERE e.environment_id = $1",
      { type: "SELECT" as never, bind: [env!.id], plain: true },
    );
    const mat0 = performance.now();
    const graph = await materialiseObservedGraph({ environmentId: env!.id });
    console.log(
      `receiver: ${TOTAL.toLocaleString()} spans in ${bodies.length} protobuf requests of ${BATCH} (${(bodies.reduce((n, b) => n + b.length, 0) / 1048576).toFixed(0)} MiB), 4 in flight: ` +
        `${(took / 1000).toFixed(2)} s, ${Math.round(TOTAL / (took / 1000)).toLocaleString()} spans/s (this process ${((recvCpu.user + recvCpu.system) / 1e6).toFixed(1)} s CPU, client included); per request p50 ${pct(latencies, 0.5).toFixed(0)} ms, p95 ${pct(latencies, 0.95).toFixed(0)} ms; ` +
        `${Number((calls as unknown as { calls: string }).calls).toLocaleString()} calls on ${(calls as unknown as { edges: string }).edges} edges (${swept} halves paired or settled after the batch); ` +
        `graph step ${Math.round(performance.now() - mat0)} ms → snapshot #${graph.snapshot?.number} with ${graph.pairs} observed pairs`,
    );
    bodies.length = 0;

    // 2. The same as one JSON Lines file, streamed.
    const file = join(tmpdir(), `pinchpoint-bench-${process.pid}.jsonl`);
    const out = createWriteStream(file);
    for (const b of batches(TOTAL, BATCH, 3)) if (!out.write(`${jsonLine(b)}\n`)) await once(out, "drain");
    out.end();
    await once(out, "finish");
    const size = statSync(file).size;
    const f0 = performance.now();
    const c2 = process.cpuUsage();
    const fileRes = await fetch(`${server.url}/api/v1/environments/bench-file/inventory?format=otlp&source=bench-file`, {
      method: "POST",
      headers: { ...auth, "content-type": "application/x-ndjson" },
      body: Readable.toWeb(createReadStream(file)) as ReadableStream<Uint8Array>,
      duplex: "half",
    } as RequestInit & { duplex: "half" });
    const fileBody = (await fileRes.json()) as { observed?: { spans: number; calls: number; edges: number }; snapshot?: { number: number } };
    const fileMs = performance.now() - f0;
    const fileCpu = process.cpuUsage(c2);
    const rss = process.memoryUsage().rss;
    rmSync(file, { force: true });
    if (fileRes.status !== 200) throw new Error(`file push answered ${fileRes.status}: ${JSON.stringify(fileBody)}`);
    console.log(
      `JSON Lines file: ${TOTAL.toLocaleString()} spans, ${(size / 1048576).toFixed(0)} MiB, streamed to ?format=otlp: ${(fileMs / 1000).toFixed(2)} s, ` +
        `${Math.round(TOTAL / (fileMs / 1000)).toLocaleString()} spans/s, this process ${((fileCpu.user + fileCpu.system) / 1e6).toFixed(1)} s CPU (${fileBody.observed?.calls.toLocaleString()} calls on ${fileBody.observed?.edges} edges, snapshot #${fileBody.snapshot?.number}); rss after ${(rss / 1048576).toFixed(0)} MiB`,
    );

    // 3. A steady 5,000 spans a second: a 1,000-span request every 200 ms for 20 s.
    const steady = [...batches(100_000, 1_000, 4)].map(protobuf);
    const times: number[] = [];
    const s0 = performance.now();
    await Promise.all(
      steady.map(async (body, i) => {
        const due = s0 + i * 200;
        await new Promise((r) => setTimeout(r, Math.max(0, due - performance.now())));
        const s = performance.now();
        const res = await post(`${server.url}/api/v1/environments/bench-steady/otlp/v1/traces`, body, { ...auth, "content-type": "application/x-protobuf" });
        if (res.status !== 200) throw new Error(`receiver answered ${res.status}`);
        times.push(performance.now() - s);
      }),
    );
    const steadyMs = performance.now() - s0;
    times.sort((a, b) => a - b);
    console.log(
      `steady load: ${steady.length} requests of 1,000 spans, one every 200 ms (5,000 spans/s offered) over ${(steadyMs / 1000).toFixed(1)} s: ` +
        `${Math.round(100_000 / (steadyMs / 1000)).toLocaleString()} spans/s taken; per request p50 ${pct(times, 0.5).toFixed(0)} ms, p95 ${pct(times, 0.95).toFixed(0)} ms, max ${times.at(-1)!.toFixed(0)} ms`,
    );
  } finally {
    await server.close();
    await closeDb();
  }
}

async function post(url: string, body: Buffer, headers: Record<string, string>): Promise<{ status: number; text: string }> {
  const res = await fetch(url, { method: "POST", headers, body: body as unknown as BodyInit });
  return { status: res.status, text: await res.text() };
}
