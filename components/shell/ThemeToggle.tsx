"use client";

import { useEffect, useState } from "react";

type Theme = "dark" | "light";

const STORE = "pp-theme";
const systemTheme = (): Theme => (window.matchMedia?.("(prefers-color-scheme: light)").matches ? "light" : "dark");

/** The theme follows the operating system (app/layout.tsx applies it before paint) until the user picks one here. */
export function ThemeToggle() {
  const [theme, setTheme] = useState<Theme>("dark");
  useEffect(() => {
    setTheme(document.documentElement.dataset.theme === "light" ? "light" : "dark");
    let chosen: string | null = null;
    try {
      chosen = localStorage.getItem(STORE);
    } catch {
      // storage refused: follow the system
    }
    if (chosen === "light" || chosen === "dark") return;
    const media = window.matchMedia?.("(prefers-color-scheme: light)");
    if (!media) return;
    const follow = () => {
      const next = systemTheme();
      document.documentElement.dataset.theme = next;
      setTheme(next);
    };
    media.addEventListener("change", follow);
    return () => media.removeEventListener("change", follow);
  }, []);
  function toggle() {
    const next: Theme = theme === "dark" ? "light" : "dark";
    document.documentElement.dataset.theme = next;
    try {
      localStorage.setItem(STORE, next);
    } catch {
      // private windows may refuse storage; the theme still applies for this page
    }
    setTheme(next);
  }
  const label = `Switch to ${theme === "dark" ? "light" : "dark"} theme`;
  return (
    // An icon keeps the header narrow; the accessible name and tooltip say the action, not the state.
    <button type="button" onClick={toggle} aria-label={label} title={label} className="inline-flex h-8 w-8 items-center justify-center rounded text-muted hover:bg-raised hover:text-ink">
      {theme === "dark" ? (
        <svg aria-hidden width="18" height="18" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round">
          <circle cx="12" cy="12" r="4" />
          <path d="M12 2v2M12 20v2M4.9 4.9l1.4 1.4M17.7 17.7l1.4 1.4M2 12h2M20 12h2M4.9 19.1l1.4-1.4M17.7 6.3l1.4-1.4" />
        </svg>
      ) : (
        <svg aria-hidden width="18" height="18" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round">
          <path d="M21 12.8A9 9 0 1 1 11.2 3a7 7 0 0 0 9.8 9.8z" />
        </svg>
      )}
    </button>
  );
}
