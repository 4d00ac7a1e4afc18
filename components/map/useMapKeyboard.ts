"use client";
// Keyboard on the canvas: arrows move the selection along needs and neighbours (keyboard.ts),
// Enter expands a team or opens the inspector, Escape closes the inspector then clears the selection.
import { useCallback, type KeyboardEvent } from "react";
import { arrowDir, nextSelection } from "./keyboard";
import type { Position } from "./types";
import type { Adjacency, MapView } from "./view";

export function useMapKeyboard(args: {
  selected: string | null;
  inspecting: string | null;
  centres: ReadonlyMap<string, Position>;
  adjacency: Adjacency;
  view: MapView;
  select(id: string | null): void;
  centreOn(id: string): boolean;
  toggleTeam(team: string): void;
  setInspecting(id: string | null): void;
}): (e: KeyboardEvent<HTMLDivElement>) => void {
  const { selected, inspecting, centres, adjacency, view, select, centreOn, toggleTeam, setInspecting } = args;
  return useCallback(
    (e: KeyboardEvent<HTMLDivElement>) => {
      if (e.target !== e.currentTarget && (e.target as HTMLElement).closest("button, input, select, textarea")) return;
      const dir = arrowDir(e.key);
      if (dir) {
        e.preventDefault();
        const next = nextSelection({ current: selected, dir, positions: centres, adjacency });
        if (next) {
          select(next);
          centreOn(next);
        }
        return;
      }
      if (e.key === "Enter" && selected) {
        e.preventDefault();
        const teamItem = view.items.find((i) => i.id === selected && i.type === "team");
        if (teamItem && teamItem.type === "team") toggleTeam(teamItem.team);
        else setInspecting(selected);
        return;
      }
      if (e.key === "Escape") {
        e.preventDefault();
        if (inspecting) setInspecting(null);
        else select(null);
      }
    },
    [selected, inspecting, centres, adjacency, view, select, centreOn, toggleTeam, setInspecting],
  );
}
