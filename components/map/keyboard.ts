// Arrow-key movement on the map: up and down follow dependency edges (down = toward what
// it needs, up = toward its dependents); left and right step to the nearest neighbour on
// roughly the same row. With no edge that way, the nearest component in that direction.
import type { Position } from "./types";
import type { Adjacency } from "./view";

export type ArrowDir = "up" | "down" | "left" | "right";

export function arrowDir(key: string): ArrowDir | null {
  switch (key) {
    case "ArrowUp":
      return "up";
    case "ArrowDown":
      return "down";
    case "ArrowLeft":
      return "left";
    case "ArrowRight":
      return "right";
    default:
      return null;
  }
}

function inDirection(dir: ArrowDir, from: Position, to: Position): boolean {
  const dx = to.x - from.x;
  const dy = to.y - from.y;
  switch (dir) {
    case "up":
      return dy < 0;
    case "down":
      return dy > 0;
    case "left":
      return dx < 0;
    case "right":
      return dx > 0;
  }
}

/** Distance that prefers staying on the axis of travel (a neighbour in the same row beats a closer one a row away). */
function cost(dir: ArrowDir, from: Position, to: Position): number {
  const dx = Math.abs(to.x - from.x);
  const dy = Math.abs(to.y - from.y);
  return dir === "left" || dir === "right" ? dx + 4 * dy : dy + 2 * dx;
}

function nearest(dir: ArrowDir, from: Position, candidates: Iterable<[string, Position]>, directional: boolean): string | null {
  let best: string | null = null;
  let bestCost = Infinity;
  for (const [id, p] of candidates) {
    if (directional && !inDirection(dir, from, p)) continue;
    const c = cost(dir, from, p);
    if (c < bestCost) {
      bestCost = c;
      best = id;
    }
  }
  return best;
}

export function nextSelection(args: {
  current: string | null;
  dir: ArrowDir;
  /** centres of the components on the canvas */
  positions: ReadonlyMap<string, Position>;
  adjacency: Adjacency;
}): string | null {
  const { current, dir, positions, adjacency } = args;
  const here = current ? positions.get(current) : undefined;
  if (!current || !here) {
    // Start at the top-left component: the entry points sit on top.
    let first: string | null = null;
    let firstPos: Position | null = null;
    for (const [id, p] of positions) {
      if (!firstPos || p.y < firstPos.y || (p.y === firstPos.y && p.x < firstPos.x)) {
        first = id;
        firstPos = p;
      }
    }
    return first;
  }
  if (dir === "up" || dir === "down") {
    const along = (dir === "down" ? adjacency.out : adjacency.in).get(current) ?? [];
    const cands: [string, Position][] = [];
    for (const id of along) {
      const p = positions.get(id);
      if (p) cands.push([id, p]);
    }
    // Prefer a neighbour drawn in the direction pressed; a back edge still counts if it is the only one.
    const hit = nearest(dir, here, cands, true) ?? nearest(dir, here, cands, false);
    if (hit) return hit;
  }
  const others = [...positions].filter(([id]) => id !== current);
  return nearest(dir, here, others, true) ?? current;
}
