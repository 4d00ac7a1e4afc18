"use client";
// The filter menu: teams, tiers, kinds and which needs are drawn.
import { COMPONENT_KINDS, TIERS, type ComponentKind, type Tier } from "@/lib/inventory/types";
import { KIND_LABEL } from "./shapes";
import { NO_FILTERS, type MapFilters } from "./view";

const ALL_KINDS: readonly ComponentKind[] = [...COMPONENT_KINDS, "undeclared"];

/** Toggle one value in a filter set where null means "all of the universe". */
function toggleIn<T>(current: ReadonlySet<T> | null, value: T, universe: readonly T[]): ReadonlySet<T> | null {
  const next = new Set(current ?? universe);
  if (next.has(value)) next.delete(value);
  else next.add(value);
  return universe.every((u) => next.has(u)) ? null : next;
}

export function FilterMenu({ filters, setFilters, slots, teamNames }: { filters: MapFilters; setFilters(update: (f: MapFilters) => MapFilters): void; slots: readonly string[]; teamNames: ReadonlyMap<string, string> }) {
  return (
    <details className="pp-menu">
      <summary className="pp-btn" aria-label="Filters">
        Filters{filters === NO_FILTERS ? "" : " •"}
      </summary>
      <div className="pp-menu-body">
        <fieldset>
          <legend>Teams</legend>
          {slots.map((s) => (
            <label key={s} className="pp-check">
              <input type="checkbox" checked={!filters.teams || filters.teams.has(s)} onChange={() => setFilters((f) => ({ ...f, teams: toggleIn(f.teams, s, slots) }))} />
              {teamNames.get(s) ?? s}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend>Tiers</legend>
          {TIERS.map((t: Tier) => (
            <label key={t} className="pp-check">
              <input type="checkbox" checked={!filters.tiers || filters.tiers.has(t)} onChange={() => setFilters((f) => ({ ...f, tiers: toggleIn(f.tiers, t, TIERS) }))} />
              Tier {t}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend>Kinds</legend>
          {ALL_KINDS.map((k) => (
            <label key={k} className="pp-check">
              <input type="checkbox" checked={!filters.kinds || filters.kinds.has(k)} onChange={() => setFilters((f) => ({ ...f, kinds: toggleIn(f.kinds, k, ALL_KINDS) }))} />
              {KIND_LABEL[k]}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend>Dependencies</legend>
          <label className="pp-check">
            <input type="checkbox" checked={filters.hard} onChange={() => setFilters((f) => ({ ...f, hard: !f.hard }))} />
            hard (down when unmet)
          </label>
          <label className="pp-check">
            <input type="checkbox" checked={filters.soft} onChange={() => setFilters((f) => ({ ...f, soft: !f.soft }))} />
            soft (degraded when unmet)
          </label>
          <label className="pp-check">
            <input type="checkbox" checked={filters.startup} onChange={() => setFilters((f) => ({ ...f, startup: !f.startup }))} />
            start-up only (boot order)
          </label>
        </fieldset>
        <button type="button" className="pp-btn" onClick={() => setFilters(() => NO_FILTERS)} aria-label="Clear all filters">
          Clear filters
        </button>
      </div>
    </details>
  );
}
