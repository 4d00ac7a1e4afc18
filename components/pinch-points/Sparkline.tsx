// Rank over recent snapshots as a 64×18 SVG polyline. Hand-drawn rather than recharts: a page
// shows 25 of these, and 25 chart instances with resize observers cost more than the table itself.
export function Sparkline({ points, width = 64, height = 18 }: { points: Array<{ snapshot: number; rank: number | null }>; width?: number; height?: number }) {
  const known = points.filter((p): p is { snapshot: number; rank: number } => p.rank !== null);
  if (known.length < 2) return <span className="text-xs text-faint">{known.length === 1 ? "new" : "—"}</span>;
  const ranks = known.map((p) => p.rank);
  const best = Math.min(...ranks);
  const worst = Math.max(...ranks);
  const span = Math.max(1, worst - best);
  const step = width / Math.max(1, points.length - 1);
  const index = new Map(points.map((p, i) => [p.snapshot, i]));
  // Rank 1 is best, so it is drawn at the top.
  const xy = known.map((p) => [(index.get(p.snapshot) ?? 0) * step, 2 + ((p.rank - best) / span) * (height - 4)] as const);
  const first = known[0]!.rank;
  const last = known[known.length - 1]!.rank;
  // Rank 1 is best, so a falling number is "better"; said in words, and drawn in a neutral ink
  // so a move is never mistaken for the vermilion "down" state.
  const moved = first === last ? "steady" : last < first ? `rank better by ${first - last}` : `rank worse by ${last - first}`;
  const tone = "var(--pp-muted)";
  const end = xy[xy.length - 1]!;
  return (
    <svg width={width} height={height} role="img" aria-label={`Rank over ${known.length} snapshots: ${first} to ${last} (${moved})`} className="overflow-visible">
      <title>{`Rank ${first} → ${last} over ${known.length} snapshots (${moved})`}</title>
      <polyline points={xy.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(" ")} fill="none" stroke={tone} strokeWidth={1.5} strokeLinejoin="round" />
      <circle cx={end[0]} cy={end[1]} r={2} fill={tone} />
    </svg>
  );
}
