// Ranks with ties (DESIGN §10): standard competition ranking ("1224"), the rank of a value being
// one more than the number of strictly greater values, so equal values share a rank and the next
// rank skips (1, 2, 2, 4). Values are compared at 12 significant digits: measures computed along
// different summation orders (the betweenness of two symmetric components, say) differ in the last
// bits, and such noise must not order components that are equal by the definition.
export function significant(x: number): number {
  return x === 0 || !Number.isFinite(x) ? x : Number(x.toPrecision(12));
}

/**
 * Competition ranks, highest value first (rank 1); `null` values (a measure that did not
 * converge) get no rank. Also how many components share each rank.
 */
export function competitionRanks(values: ArrayLike<number | null>): { rank: Array<number | null>; tied: Int32Array } {
  const n = values.length;
  const order: number[] = [];
  for (let v = 0; v < n; v++) if (values[v] !== null && values[v] !== undefined) order.push(v);
  const key = order.map((v) => significant(values[v] as number));
  const idx = order.map((_, i) => i).sort((a, b) => key[b]! - key[a]!);
  const rank: Array<number | null> = new Array<number | null>(n).fill(null);
  const tied = new Int32Array(n);
  for (let i = 0; i < idx.length; ) {
    let j = i;
    while (j < idx.length && key[idx[j]!] === key[idx[i]!]) j++;
    for (let t = i; t < j; t++) {
      const v = order[idx[t]!]!;
      rank[v] = i + 1;
      tied[v] = j - i;
    }
    i = j;
  }
  return { rank, tied };
}
