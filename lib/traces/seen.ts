// Which (trace id, span id) pairs were seen, so a span sent twice counts once. OTLP exporters resend
// a request whose answer they did not get ("Known Limitations · Duplicate Data" in the OTLP
// specification), and files are often concatenated exports. Our own hash set: a JavaScript Set of
// id strings costs about 100 bytes a span, this one 8 (two 32-bit hashes in open addressing), which
// is what lets a million-span file and a busy receiver remember every id. Two different spans share
// a 64-bit hash with probability about n²/2⁶⁵ (3·10⁻⁸ for a million spans).

/** The 64-bit hash of the last spanHash() call, as two 32-bit halves (no array per span). */
export const lastHash = { hi: 0, lo: 0 };

/** FNV-1a (32-bit) twice, with different offset bases, over "trace/span"; into lastHash. */
export function spanHash(trace: string, span: string): void {
  let a = 0x811c9dc5;
  let b = 0x01000193 ^ 0x5bd1e995;
  for (let i = 0; i < trace.length; i++) {
    const c = trace.charCodeAt(i);
    a = Math.imul(a ^ c, 0x01000193);
    b = Math.imul(b ^ c, 0x01000193) ^ (b >>> 15);
  }
  a = Math.imul(a ^ 47, 0x01000193);
  for (let i = 0; i < span.length; i++) {
    const c = span.charCodeAt(i);
    a = Math.imul(a ^ c, 0x01000193);
    b = Math.imul(b ^ c, 0x01000193) ^ (b >>> 15);
  }
  lastHash.hi = a >>> 0 || 1;
  lastHash.lo = b >>> 0;
}

function hash64(trace: string, span: string): [number, number] {
  spanHash(trace, span);
  return [lastHash.hi, lastHash.lo];
}

/** Open addressing with linear probing on a 64-bit key (hi, lo; hi never 0): the key's slot, or the empty one it would take. */
function slotOf(hi: Uint32Array, lo: Uint32Array, mask: number, h: number, l: number): number {
  let i = (h ^ Math.imul(l, 0x9e3779b1)) & mask;
  for (;;) {
    const s = hi[i]!;
    if (s === 0 || (s === h && lo[i] === l)) return i;
    i = (i + 1) & mask;
  }
}

/** A growing set of span ids (the whole of one file). */
export class SpanIdSet {
  private hi: Uint32Array;
  private lo: Uint32Array;
  private mask: number;
  size = 0;

  constructor(initialSlots = 1 << 12) {
    this.hi = new Uint32Array(initialSlots);
    this.lo = new Uint32Array(initialSlots);
    this.mask = initialSlots - 1;
  }

  private find(h: number, l: number): number {
    return slotOf(this.hi, this.lo, this.mask, h, l);
  }

  hasHash(h: number, l: number): boolean {
    return this.hi[this.find(h, l)] !== 0;
  }

  /** Adds; false when it was there already. */
  addHash(h: number, l: number): boolean {
    const i = this.find(h, l);
    if (this.hi[i] !== 0) return false;
    this.hi[i] = h;
    this.lo[i] = l;
    this.size++;
    if (this.size * 2 > this.hi.length) this.grow();
    return true;
  }

  add(trace: string, span: string): boolean {
    const [h, l] = hash64(trace, span);
    return this.addHash(h, l);
  }

  has(trace: string, span: string): boolean {
    const [h, l] = hash64(trace, span);
    return this.hasHash(h, l);
  }

  private grow(): void {
    const { hi, lo } = this;
    this.hi = new Uint32Array(hi.length * 2);
    this.lo = new Uint32Array(lo.length * 2);
    this.mask = this.hi.length - 1;
    for (let i = 0; i < hi.length; i++) {
      if (hi[i] !== 0) {
        const j = this.find(hi[i]!, lo[i]!);
        this.hi[j] = hi[i]!;
        this.lo[j] = lo[i]!;
      }
    }
  }
}

/**
 * The most recent span ids of a stream of requests, in bounded memory: two generations of at most
 * `perGeneration` ids each; when the newer fills, the older is dropped. Remembers at least the last
 * `perGeneration` ids — with the default, the last half million spans (minutes at thousands of
 * spans a second, well past any exporter's retry).
 */
export class RecentSpanIds {
  private current = new SpanIdSet();
  private previous = new SpanIdSet();

  constructor(private readonly perGeneration = 500_000) {}

  has(trace: string, span: string): boolean {
    const [h, l] = hash64(trace, span);
    return this.hasHash(h, l);
  }

  hasHash(h: number, l: number): boolean {
    return this.previous.hasHash(h, l) || this.current.hasHash(h, l);
  }

  addHash(h: number, l: number): boolean {
    if (this.previous.hasHash(h, l)) return false;
    if (!this.current.addHash(h, l)) return false;
    if (this.current.size >= this.perGeneration) {
      this.previous = this.current;
      this.current = new SpanIdSet();
    }
    return true;
  }

  add(trace: string, span: string): boolean {
    const [h, l] = hash64(trace, span);
    return this.addHash(h, l);
  }
}

/** Ids remembered across requests; a request's ids are added only once its fold is stored. */
export interface SpanIdMemory {
  hasHash(hi: number, lo: number): boolean;
  addHash(hi: number, lo: number): boolean;
}

/**
 * (trace id, span id) → a small integer, for one batch: the fold's lookups of children and parents
 * by id without building an id string a span (same hashing, same open addressing as SpanIdSet).
 */
export class SpanIndex {
  private readonly hi: Uint32Array;
  private readonly lo: Uint32Array;
  private readonly value: Int32Array;
  private readonly mask: number;

  constructor(expected: number) {
    let slots = 16;
    while (slots < expected * 2) slots *= 2;
    this.hi = new Uint32Array(slots);
    this.lo = new Uint32Array(slots);
    this.value = new Int32Array(slots);
    this.mask = slots - 1;
  }

  private find(h: number, l: number): number {
    return slotOf(this.hi, this.lo, this.mask, h, l);
  }

  /** Keeps the first value set for a key. */
  setIfAbsent(h: number, l: number, v: number): void {
    const i = this.find(h, l);
    if (this.hi[i] !== 0) return;
    this.hi[i] = h;
    this.lo[i] = l;
    this.value[i] = v;
  }

  /** The value, or -1. */
  get(h: number, l: number): number {
    const i = this.find(h, l);
    return this.hi[i] === 0 ? -1 : this.value[i]!;
  }
}
