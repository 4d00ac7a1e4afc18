"use client";

import { useEffect, useState } from "react";

type Theme = "dark" | "light";

export function ThemeToggle() {
  const [theme, setTheme] = useState<Theme>("dark");
  useEffect(() => {
    setTheme(document.documentElement.dataset.theme === "light" ? "light" : "dark");
  }, []);
  function toggle() {
    const next: Theme = theme === "dark" ? "light" : "dark";
    document.documentElement.dataset.theme = next;
    try {
      localStorage.setItem("pp-theme", next);
    } catch {
      // private windows may refuse storage; the theme still applies for this page
    }
    setTheme(next);
  }
  return (
    // The visible text names the action, not a bare "Light"/"Dark" that could read as the current state.
    <button type="button" onClick={toggle} className="text-muted hover:text-ink" title={`Theme: ${theme}`}>
      {`Switch to ${theme === "dark" ? "light" : "dark"} theme`}
    </button>
  );
}
