// The main navigation: every screen of DESIGN §6 at its stable URL, grouped so the header fits at
// 1280 px and below: the screens people open to do a job, then the reference screens under "More".
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

/** What on-call staff, architects, leads and engineers open first. */
export const PRIMARY_NAV: NavItem[] = [
  { label: "Overview", href: (env) => envPath(env), match: (p, env) => p === "/" || p === envPath(env) },
  { label: "Incidents", href: (env) => envPath(env, "/incidents"), match: under("/incidents") },
  { label: "Drills", href: (env) => envPath(env, "/drills"), match: under("/drills") },
  { label: "Map", href: (env) => envPath(env, "/map"), match: under("/map") },
  { label: "Pinch points", href: (env) => envPath(env, "/pinch-points"), match: under("/pinch-points") },
  { label: "Components", href: (env) => envPath(env, "/components"), match: under("/components") },
  { label: "Imports", href: (env) => envPath(env, "/imports"), match: under("/imports") },
  { label: "Teams", href: () => "/teams", match: (p) => p.startsWith("/teams") },
];

/** Reference screens: read when planning or reviewing, not during the job itself. */
export const MORE_NAV: NavItem[] = [
  { label: "Reviews", href: (env) => envPath(env, "/reviews"), match: under("/reviews") },
  { label: "Cold start", href: (env) => envPath(env, "/boot-order"), match: under("/boot-order") },
  { label: "History", href: (env) => envPath(env, "/history"), match: under("/history") },
  { label: "Drift", href: (env) => envPath(env, "/drift"), match: under("/drift") },
  { label: "Policies", href: (env) => envPath(env, "/policies"), match: under("/policies") },
  { label: "File format", href: () => "/format", match: (p) => p.startsWith("/format") },
];

// Architects reach the audit log here; admins everything else as well. Shown apart from the role.
export const ADMIN_NAV: NavItem = { label: "Admin", href: () => "/admin", match: (p) => p.startsWith("/admin"), permission: "reviews:write" };

export function envFromPath(path: string, fallback: string): string {
  const segment = /^\/environments\/([^/?#]+)/.exec(path)?.[1];
  return segment && SLUG_PATTERN.test(segment) ? segment : fallback;
}

/**
 * Test and scratch environments are listed apart in the switcher. Pinchpoint stores no kind of
 * environment, so the slug decides, by the common naming practice of a prefix or suffix.
 */
export function isScratchEnvironment(slug: string): boolean {
  return /^(test|testing|scratch|sandbox|tmp|temp|ci|dev|e2e|demo)(-|$)|-(test|testing|scratch|sandbox|tmp|temp|ci|dev|e2e)$/.test(slug);
}
