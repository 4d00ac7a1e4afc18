// The Harbor Pantry demo (an invented company): teams, one account per role, and the inventory
// pushed from examples/harbor-pantry/ through the same path as a CI push — so a pushed file and
// the seed give the same graph.
import "server-only";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { parse as parseYaml } from "yaml";
import { z } from "zod";
import { db } from "@/models";
import { ROLES, type Role } from "@/lib/auth/roles";
import { pushInventory, type PushResult } from "./push";
import { addMembership, upsertTeams } from "./teams";
import { hashPassword } from "./users";

export const DEMO_PASSWORD = "pinchpoint-demo";
const DEMO_DOMAIN = "harbor-pantry.example";
const DEMO_ENVIRONMENT = "production";
const demoEmail = (role: Role) => `${role}@${DEMO_DOMAIN}`;

const teamsFileSchema = z.object({
  teams: z.array(
    z.object({
      slug: z.string(),
      name: z.string(),
      email: z.string().nullable().optional(),
      onCall: z.string().nullable().optional(),
      description: z.string().nullable().optional(),
    }),
  ),
});

const DEMO_NAMES: Record<Role, string> = {
  admin: "Ada Quayle (admin)",
  architect: "Rui Marsh (architect)",
  lead: "Noor Harbison (lead, checkout)",
  engineer: "Tomas Keel (engineer, checkout)",
  viewer: "Iris Pollard (viewer)",
};

/**
 * `afterPush` runs after each file's push: the seed analyses every snapshot there, so the demo's
 * history has a rank trend (a queue left to itself analyses only the newest of a burst of pushes).
 */
export async function seedDemo({
  examplesDir,
  log = console.log,
  afterPush,
}: {
  examplesDir: string;
  log?: (line: string) => void;
  afterPush?: () => Promise<unknown>;
}): Promise<{ pushes: PushResult[] }> {
  const { User } = db().models;
  const teamsDoc = teamsFileSchema.parse(parseYaml(await readFile(path.join(examplesDir, "teams.yaml"), "utf8")));
  const teams = await upsertTeams({
    teams: teamsDoc.teams.map((t) => ({ slug: t.slug, name: t.name, email: t.email ?? null, oncall: t.onCall ?? null, description: t.description ?? null })),
  });
  log(`[seed] ${teams.length} teams`);

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const role of ROLES) {
    const email = demoEmail(role);
    const [user, created] = await User.findOrCreate({
      where: { email },
      defaults: { email, name: DEMO_NAMES[role], role, passwordHash, oidcSubject: null },
    });
    if (!created && (user.role !== role || !user.active || !user.passwordHash)) {
      await user.update({ role, active: true, passwordHash });
    }
    const checkout = teams.find((t) => t.slug === "checkout");
    if (checkout && (role === "lead" || role === "engineer")) {
      await addMembership({ userId: user.id, teamId: checkout.id, isLead: role === "lead" });
    }
  }
  log(`[seed] demo accounts: ${ROLES.map(demoEmail).join(", ")} (password: ${DEMO_PASSWORD})`);

  const files = (await readdir(examplesDir)).filter((f) => /\.ya?ml$/.test(f) && f !== "teams.yaml").sort();
  const pushes: PushResult[] = [];
  for (const file of files) {
    const body = await readFile(path.join(examplesDir, file));
    const result = await pushInventory({
      environment: DEMO_ENVIRONMENT,
      format: "pinchpoint",
      body,
      contentType: "application/yaml",
      dryRun: false,
      actor: { type: "system", label: "demo seed", canCreateEnvironments: true },
    });
    pushes.push(result);
    log(`[seed] ${file}: ${result.changed ? `snapshot #${result.snapshot?.number}` : "unchanged"}`);
    await afterPush?.();
  }
  return { pushes };
}
