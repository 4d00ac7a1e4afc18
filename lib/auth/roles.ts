// Roles and what each may do (DESIGN §5). Edge-safe: no Node-only imports.

export const ROLES = ["admin", "architect", "lead", "engineer", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export type Permission =
  | "read" // read everything, run drills
  | "inventory:write" // upload or push inventory
  | "components:annotate" // assign owners and write notes (leads: their own team's components)
  | "reviews:write" // risk reviews and pinch-score weights
  | "admin"; // users, roles, tokens, environments

const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  viewer: ["read"],
  engineer: ["read", "inventory:write"],
  lead: ["read", "inventory:write", "components:annotate"],
  architect: ["read", "inventory:write", "components:annotate", "reviews:write"],
  admin: ["read", "inventory:write", "components:annotate", "reviews:write", "admin"],
};

export function roleHas(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].includes(permission);
}

/** Token scopes (DESIGN §4): a token carries scopes, never a role. */
export const TOKEN_SCOPES = ["inventory:write", "read"] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  architect: "Architect",
  lead: "Team lead",
  engineer: "Engineer",
  viewer: "Viewer",
};
