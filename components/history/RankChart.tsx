"use client";
// How the current top pinch points' ranks moved across snapshots. recharts here (one chart per
// page, tooltips and a legend wanted); rank 1 is drawn at the top.
import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { RankTrendResponse as RankTrend } from "@/lib/api/schemas/analysis";

// Okabe–Ito colour-blind-safe set plus two viridis stops: eight lines stay distinguishable.
const COLOURS = ["#e69f00", "#56b4e9", "#009e73", "#f0e442", "#0072b2", "#d55e00", "#cc79a7", "#5ec962"];

// Log scale: moving from 40th to 30th matters less than from 3rd to 1st, and the top is what is read.
const TICKS = [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000];

const lastIndex = (points: Array<{ rank: number | null }>) => points.findLastIndex((p) => p.rank !== null);

export function RankChart({ trend }: { trend: RankTrend }) {
  const data = trend.snapshots.map((n, i) => {
    const row: Record<string, number | null> = { snapshot: n };
    for (const s of trend.series) row[s.key] = s.points[i]?.rank ?? null;
    return row;
  });
  const worst = Math.max(1, ...trend.series.flatMap((s) => s.points.map((p) => p.rank ?? 0)));
  return (
    <figure aria-label={`Rank by betweenness of the current top ${trend.series.length} components over snapshots #${trend.snapshots[0] ?? "?"} to #${trend.snapshots.at(-1) ?? "?"}`} data-testid="rank-chart">
      <div className="h-72 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 14, right: 16, bottom: 8, left: 0 }}>
            <CartesianGrid stroke="var(--color-line)" strokeDasharray="2 4" />
            <XAxis dataKey="snapshot" tickFormatter={(n: number) => `#${n}`} stroke="var(--color-muted)" fontSize={11} />
            <YAxis reversed scale="log" domain={[1, worst]} ticks={TICKS.filter((t) => t <= worst)} allowDecimals={false} stroke="var(--color-muted)" fontSize={11} width={36} label={{ value: "rank", angle: -90, position: "insideLeft", fill: "var(--color-muted)", fontSize: 11 }} />
            <Tooltip
              contentStyle={{ background: "var(--color-surface)", border: "1px solid var(--color-line)", fontSize: 12 }}
              labelFormatter={(n) => `snapshot #${String(n)}`}
              formatter={(v, name) => [`rank ${String(v)}`, String(name)]}
            />
            <Legend wrapperStyle={{ fontSize: 12 }} />
            {trend.series.map((s, i) => (
              <Line
                key={s.key}
                type="linear"
                dataKey={s.key}
                stroke={COLOURS[i % COLOURS.length]}
                strokeWidth={2}
                dot={{ r: 2 }}
                connectNulls
                isAnimationActive={false}
                // Each line named at its last point, in ink: colour alone does not tell eight lines apart
                // (yellow all but vanishes on the light canvas).
                label={(p: { x?: number | string; y?: number | string; index?: number }) =>
                  p.index === lastIndex(s.points) ? (
                    <text key={`${s.key}-label`} x={Number(p.x) + 4} y={Number(p.y) - 4} fontSize={10} fill="var(--color-ink)" textAnchor="end">
                      {s.key}
                    </text>
                  ) : (
                    <g key={`${s.key}-${p.index ?? 0}`} />
                  )
                }
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-xs text-muted">Rank by betweenness: rank 1 (top) is the component most shortest paths run through. Lines start where a component first appears in an analysed snapshot; the rank axis is logarithmic.</figcaption>
    </figure>
  );
}
