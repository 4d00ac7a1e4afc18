// The demo seed and the CI examples agree: pushing the example files from examples/harbor-pantry
// through the API (as CI would, with a token) after seeding changes nothing. Also: sign-in limits.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { authOptions, SIGN_IN_ERRORS } from "@/lib/auth/options";
import { SIGN_IN_LIMITS } from "@/lib/data/sign-in-attempts";
import { seedDemo, DEMO_PASSWORD } from "@/lib/data/seed";
import { db } from "@/models";
import { call, createApiToken, createUser } from "../support/api";

const examples = path.resolve(__dirname, "../../examples/harbor-pantry");

beforeAll(async () => {
  await seedDemo({ examplesDir: examples, log: () => undefined });
});

describe("demo seed", () => {
  it("builds the Harbor Pantry graph: about 150 components over 12 teams, with its weak spots", async () => {
    const { Component, Team, User } = db().models;
    const components = await Component.findAll();
    expect(components.length).toBeGreaterThanOrEqual(140);
    expect(await Team.count()).toBe(12);
    expect(await User.count()).toBe(5);
    const keys = new Set(components.map((c) => c.key));
    for (const k of ["session-service", "harbor-bus", "dns-resolver", "slot-service", "picking-capacity"]) expect(keys).toContain(k);
    expect(components.filter((c) => c.kind === "undeclared").map((c) => c.key).sort()).toEqual(["promo-engine", "warehouse-scanner-hub"]);
    expect(components.find((c) => c.key === "harbor-bus")?.zones).toEqual(["harbor-east"]);
  });

  it("is what a CI push of the example files gives: re-pushing each file changes nothing", async () => {
    const admin = await createUser("admin");
    const token = await createApiToken({ scopes: ["inventory:write"], createdBy: admin.id });
    const files = readdirSync(examples).filter((f) => f.endsWith(".yaml") && f !== "teams.yaml");
    expect(files.length).toBe(13);
    for (const file of files) {
      const res = await call(push, {
        url: "/api/v1/environments/production/inventory",
        method: "POST",
        params: { env: "production" },
        as: { token },
        body: readFileSync(path.join(examples, file), "utf8"),
        headers: { "content-type": "application/yaml" },
      });
      expect({ file, status: res.status, changed: (res.json as { changed: boolean }).changed }).toEqual({ file, status: 200, changed: false });
    }
  });

  it("is idempotent: seeding again changes nothing", async () => {
    const { pushes } = await seedDemo({ examplesDir: examples, log: () => undefined });
    expect(pushes.every((p) => !p.changed)).toBe(true);
  });
});

describe("sign-in", () => {
  const credentials = authOptions.providers.find((p) => p.id === "credentials") as unknown as {
    options: { authorize(raw: Record<string, string>, req: { headers: Record<string, string> }): Promise<unknown> };
  };
  const attempt = (email: string, password: string, ip = "198.51.100.7") => credentials.options.authorize({ email, password }, { headers: { "x-forwarded-for": ip } });

  it("accepts the demo password and refuses a wrong one with a readable message", async () => {
    await expect(attempt("viewer@harbor-pantry.example", DEMO_PASSWORD)).resolves.toMatchObject({ email: "viewer@harbor-pantry.example", role: "viewer" });
    await expect(attempt("viewer@harbor-pantry.example", "wrong")).rejects.toThrow(SIGN_IN_ERRORS.wrong);
    await expect(attempt("nobody@harbor-pantry.example", "wrong")).rejects.toThrow(SIGN_IN_ERRORS.wrong);
  });

  it("limits failed attempts per account, even with the right password afterwards", async () => {
    for (let i = 0; i < SIGN_IN_LIMITS.account; i++) await expect(attempt("engineer@harbor-pantry.example", "wrong", `203.0.113.${i}`)).rejects.toThrow(SIGN_IN_ERRORS.wrong);
    await expect(attempt("engineer@harbor-pantry.example", DEMO_PASSWORD, "203.0.113.99")).rejects.toThrow(SIGN_IN_ERRORS.limited);
  });

  it("lets no more than the limit of parallel guesses reach a password check", async () => {
    const results = await Promise.allSettled(Array.from({ length: 12 }, (_, i) => attempt("lead@harbor-pantry.example", `guess-${i}`, `198.18.0.${i}`)));
    const messages = results.map((r) => (r.status === "rejected" ? String((r.reason as Error).message) : "accepted"));
    expect(messages.filter((m) => m === SIGN_IN_ERRORS.wrong).length).toBeLessThanOrEqual(SIGN_IN_LIMITS.account);
    expect(messages.filter((m) => m === SIGN_IN_ERRORS.wrong || m === SIGN_IN_ERRORS.limited)).toHaveLength(12);
    await expect(attempt("lead@harbor-pantry.example", DEMO_PASSWORD, "198.18.1.1")).rejects.toThrow(SIGN_IN_ERRORS.limited);
  });

  it("limits failed attempts per address across accounts", async () => {
    for (let i = 0; i < SIGN_IN_LIMITS.address; i++) await attempt(`someone-${i}@harbor-pantry.example`, "wrong", "192.0.2.50").catch(() => undefined);
    await expect(attempt("architect@harbor-pantry.example", DEMO_PASSWORD, "192.0.2.50")).rejects.toThrow(SIGN_IN_ERRORS.limited);
    await expect(attempt("architect@harbor-pantry.example", DEMO_PASSWORD, "192.0.2.51")).resolves.toMatchObject({ role: "architect" });
  });
});
