// Prepared analysis pages in memory, keyed by what they depend on (environment, the served
// analysis and owners — ServedAnalysis.version — and the query), bounded by total size with the
// least recently used page evicted first. Analysis results never change once stored, so a page
// only goes stale when its key does; concurrent readers of the same page share one query.
// Kept on globalThis: Next may bundle this module more than once.
import "server-only";

const MAX_BYTES = Number(process.env.PINCHPOINT_PAGE_CACHE_MB ?? 64) * 1024 * 1024;

interface Entry {
  value: Promise<Buffer>;
  bytes: number;
}

const holder = globalThis as unknown as { __pinchpointPages?: { map: Map<string, Entry>; bytes: number } };
const state = (holder.__pinchpointPages ??= { map: new Map(), bytes: 0 });

function evict(): void {
  for (const [key, entry] of state.map) {
    if (state.bytes <= MAX_BYTES) break;
    state.map.delete(key);
    state.bytes -= entry.bytes;
  }
}

/**
 * The cached page for `key`, or what `build` makes of it (a JSON fragment), stored if it fits. Kept
 * as UTF-8 bytes: a thousand-row page is half a megabyte, and encoding it again for every reader
 * cost more than the rest of the request.
 */
export async function cachedPage(key: string, build: () => Promise<string>): Promise<Buffer> {
  const hit = state.map.get(key);
  if (hit) {
    state.map.delete(key);
    state.map.set(key, hit);
    return hit.value;
  }
  const entry: Entry = { value: build().then((text) => Buffer.from(text, "utf8")), bytes: 0 };
  state.map.set(key, entry);
  try {
    const text = await entry.value;
    if (state.map.get(key) === entry) {
      entry.bytes = text.length;
      state.bytes += entry.bytes;
      if (entry.bytes > MAX_BYTES / 4) {
        state.map.delete(key);
        state.bytes -= entry.bytes;
      }
      evict();
    }
    return text;
  } catch (error) {
    if (state.map.get(key) === entry) state.map.delete(key);
    throw error;
  }
}
