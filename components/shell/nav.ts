// The main navigation: every screen of DESIGN §6 at its stable URL.
import type { Permission } from "@/lib/auth/roles";
import { SLUG_PATTERN } from "@/lib/inventory/types";

export interface NavItem {
  label: string;
  href: (env: string) => string;
  match: (path: string, env: string) => boolean;
  /** shown only to callers with this permission (the page checks again on the server) */
  permission?: Permission;
}

const envPath = (env: string, rest = "") => `/environments/${env}${rest}`;
const under = (rest: string) => (path: string, env: string) => path.startsWith(envPath(env, rest));

export const NAV: NavItem[] = [
  { label: "Overview", href: (env) => envPath(env), match: (p, env) => p === "/" || p === envPath(env) },
  { label: "Map", href: (env) => envPath(env, "/map"), match: under("/map") },
  { label: "Pinch points", href: (env) => envPath(env, "/pinch-points"), match: under("/pinch-points") },
  { label: "Drills", href: (env) => envPath(env, "/drills"), match: under("/drills") },
  { label: "Incidents", href: (env) => envPath(env, "/incidents"), match: under("/incidents") },
  { label: "Cold start", href: (env) => envPath(env, "/boot-order"), match: under("/boot-order") },
  { label: "Components", href: (env) => envPath(env, "/components"), match: under("/components") },
  { label: "Imports", href: (env) => envPath(env, "/imports"), match: under("/imports") },
  { label: "History", href: (env) => envPath(env, "/history"), match: under("/history") },
  { label: "Drift", href: (env) => envPath(env, "/drift"), match: under("/drift") },
  { label: "Reviews", href: (env) => envPath(env, "/reviews"), match: under("/reviews") },
  { label: "Policies", href: (env) => envPath(env, "/policies"), match: under("/policies") },
  { label: "Teams", href: () => "/teams", match: (p) => p.startsWith("/teams") },
  // Architects reach the audit log here; admins everything else as well.
  { label: "Admin", href: () => "/admin", match: (p) => p.startsWith("/admin"), permission: "reviews:write" },
];

export function envFromPath(path: string, fallback: string): string {
  const segment = /^\/environments\/([^/?#]+)/.exec(path)?.[1];
  return segment && SLUG_PATTERN.test(segment) ? segment : fallback;
}
