// Who is told what: the notices read the real tables, queue in the outbox and the queue `mail`,
// and the sink receives the messages with the right recipients. Metrics rows are written directly so that which
// component enters the top ten is set by the test, not by the analysis.
import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/models";
import { noticeInvite, noticeOwnerAssigned, noticeReviewsDue, noticeTopTenChanges } from "@/lib/mail/notices";
import { deliverDueMail } from "@/lib/jobs/mail";
import { createUser, type TestUser } from "../support/api";
import { mailSinkForFile, TEST_FROM } from "../support/mail-sink";

const sink = mailSinkForFile();
let envId: string;
let architects: TestUser[];
let lead: TestUser;

async function deliverAll() {
  await deliverDueMail({ transport: sink.transport(), from: TEST_FROM });
  return sink.emls();
}

async function snapshot(number: number) {
  return db().models.Snapshot.create({
    environmentId: envId,
    number,
    hash: randomBytes(32).toString("hex"),
    content: { components: [], dependencies: [] },
    componentCount: 0,
    dependencyCount: 0,
    undeclaredCount: 0,
    sourceName: "test",
    format: "pinchpoint",
    actorLabel: "test",
  });
}

/** Metrics of one snapshot from [key, pinchScore, declared team] triples. */
async function metrics(snapshotId: string, rows: [string, number, string | null][]) {
  await db().models.ComponentMetric.bulkCreate(
    rows.map(([key, pinchScore, team], i) => ({
      snapshotId,
      key,
      name: key.toUpperCase(),
      kind: "service" as const,
      team,
      tier: 1 as const,
      betweenness: 0,
      pagerank: 0,
      eigenvector: 0,
      clustering: 0,
      articulation: false,
      inCycle: false,
      blastDown: 10 + i,
      blastDegraded: i,
      pinchScore,
      rank: i + 1,
    })),
  );
}

beforeAll(async () => {
  const { Environment, Team, Component, Source } = db().models;
  envId = (await Environment.create({ slug: "production", name: "Production", pinchWeights: null })).id;
  const source = await Source.create({ environmentId: envId, name: "storefront-repo", lastFormat: "pinchpoint", lastPushAt: new Date() });
  await Team.bulkCreate([
    { slug: "checkout", name: "Checkout", email: "checkout@harbor-pantry.example", oncall: null, description: null },
    { slug: "storefront", name: "Storefront", email: "storefront@harbor-pantry.example", oncall: null, description: null },
    { slug: "quiet", name: "Quiet", email: null, oncall: null, description: null },
  ]);
  await Component.create({ environmentId: envId, key: "session-store", name: "Session store", kind: "datastore", team: "storefront", tier: 1, replicas: 1, zones: [], tags: [], links: {}, sourceId: source.id });
  architects = [await createUser("architect", "arch-one@harbor-pantry.example"), await createUser("architect", "arch-two@harbor-pantry.example")];
  const retired = await createUser("architect", "arch-retired@harbor-pantry.example");
  await db().models.User.update({ active: false }, { where: { id: retired.id } });
  lead = await createUser("lead", "lead@harbor-pantry.example");
});

describe("noticeOwnerAssigned", () => {
  it("mails the new owner team's address, naming the component, environment and who assigned it", async () => {
    expect(await noticeOwnerAssigned({ environmentId: envId, key: "session-store", team: "checkout", actorLabel: "lead@harbor-pantry.example" })).toBe(1);
    const [mail, ...rest] = await deliverAll();
    expect(rest).toHaveLength(0);
    expect(mail?.to).toBe("checkout@harbor-pantry.example");
    expect(mail?.subject).toBe("[Pinchpoint] Checkout now owns session-store in production");
    expect(mail?.text).toContain("lead@harbor-pantry.example assigned Session store (session-store) in environment Production");
    expect(mail?.text).toContain("/environments/production/components/session-store");
  });

  it("sends nothing when the owner is removed or the team has no address", async () => {
    expect(await noticeOwnerAssigned({ environmentId: envId, key: "session-store", team: null, actorLabel: "x" })).toBe(0);
    expect(await noticeOwnerAssigned({ environmentId: envId, key: "session-store", team: "quiet", actorLabel: "x" })).toBe(0);
    expect(await db().models.OutboxMessage.count()).toBe(0);
  });

  it("joins the caller's transaction: rolled back with it, and its own failure never fails the caller", async () => {
    await db().sequelize
      .transaction(async (t) => {
        await noticeOwnerAssigned({ environmentId: envId, key: "session-store", team: "checkout", actorLabel: "x" }, t);
        throw new Error("annotation failed");
      })
      .catch(() => undefined);
    expect(await db().models.OutboxMessage.count()).toBe(0);

    // An unknown environment makes the notice fail inside its savepoint; the caller's own write still commits.
    await db().sequelize.transaction(async (t) => {
      await db().models.Team.update({ description: "committed" }, { where: { slug: "quiet" }, transaction: t });
      expect(await noticeOwnerAssigned({ environmentId: "00000000-0000-4000-8000-000000000000", key: "k", team: "checkout", actorLabel: "x" }, t)).toBe(0);
    });
    expect((await db().models.Team.findOne({ where: { slug: "quiet" } }))?.description).toBe("committed");
    expect(await db().models.OutboxMessage.count()).toBe(0);
  });
});

describe("noticeTopTenChanges", () => {
  it("mails each newcomer's effective owner team and every active architect, once", async () => {
    const s1 = await snapshot(1);
    const s2 = await snapshot(2);
    // Snapshot 1: c01…c10 are the top ten; "session-store" (11th) and "bus" (12th) are below.
    const base: [string, number, string | null][] = Array.from({ length: 10 }, (_, i) => [`c${String(i + 1).padStart(2, "0")}`, 90 - i, "storefront"]);
    await metrics(s1.id, [...base, ["session-store", 5, "storefront"], ["bus", 4, null]]);
    // Snapshot 2: session-store jumps to first and bus to second; c09, c10 fall out.
    await metrics(s2.id, [["session-store", 95, "storefront"], ["bus", 93, null], ...base.slice(0, 8), ...base.slice(8).map(([k, , t]): [string, number, string | null] => [k, 1, t])]);
    // session-store is declared by storefront but owned, in Pinchpoint, by checkout: the annotation wins.
    await db().models.ComponentAnnotation.create({ environmentId: envId, key: "session-store", ownerTeam: "checkout", notes: null, updatedBy: lead.id });

    expect(await noticeTopTenChanges({ environmentId: envId, snapshotId: s2.id, previousSnapshotId: s1.id })).toBe(3);
    const mails = await deliverAll();
    const byTo = new Map(mails.map((m) => [m.to, m]));
    expect([...byTo.keys()].sort()).toEqual(["arch-one@harbor-pantry.example", "arch-two@harbor-pantry.example", "checkout@harbor-pantry.example"]);
    const team = byTo.get("checkout@harbor-pantry.example");
    expect(team?.subject).toBe("[Pinchpoint] session-store entered the top ten pinch points in production");
    expect(team?.text).toContain("#1  session-store (SESSION-STORE): pinch score 95.0, blast radius 10 down / 0 degraded, team checkout");
    expect(team?.text).not.toContain("bus");
    const arch = byTo.get("arch-one@harbor-pantry.example");
    expect(arch?.subject).toBe("[Pinchpoint] 2 components entered the top ten pinch points in production");
    expect(arch?.text).toContain("Snapshot 2 of Production (production)");
    expect(arch?.text).toContain("#2  bus (BUS): pinch score 93.0, blast radius 11 down / 1 degraded, unowned");
    expect(arch?.text).toContain("/environments/production/pinch-points");

    // An analysis that runs again for the same snapshot announces nothing new.
    expect(await noticeTopTenChanges({ environmentId: envId, snapshotId: s2.id, previousSnapshotId: s1.id })).toBe(0);

    // Unchanged top ten from snapshot 2 to 3: nothing to say.
    const s3 = await snapshot(3);
    await metrics(s3.id, [["session-store", 95, "storefront"], ["bus", 93, null], ...base.slice(0, 8)]);
    expect(await noticeTopTenChanges({ environmentId: envId, snapshotId: s3.id, previousSnapshotId: s2.id })).toBe(0);
  });

  it("compares with the latest analysed snapshot when the previous one has no results, and sends nothing for a first analysis", async () => {
    const { Environment } = db().models;
    const other = await Environment.create({ slug: "staging", name: "Staging", pinchWeights: null });
    const save = envId;
    envId = other.id;
    try {
      const s1 = await snapshot(1);
      await metrics(s1.id, [["a", 50, "checkout"], ["b", 40, "checkout"]]);
      expect(await noticeTopTenChanges({ environmentId: envId, snapshotId: s1.id, previousSnapshotId: null })).toBe(0);
      const s2 = await snapshot(2); // never analysed
      const s3 = await snapshot(3);
      await metrics(s3.id, [["a", 50, "checkout"], ["b", 40, "checkout"], ["c", 30, "checkout"]]);
      expect(await noticeTopTenChanges({ environmentId: envId, snapshotId: s3.id, previousSnapshotId: s2.id })).toBe(3);
      const mails = await deliverAll();
      expect(mails.find((m) => m.to === "checkout@harbor-pantry.example")?.subject).toBe("[Pinchpoint] c entered the top ten pinch points in staging");
    } finally {
      envId = save;
    }
  });
});

describe("noticeReviewsDue", () => {
  const review = (key: string, reviewBy: string | null, status: "accepted" | "mitigating" | "resolved", reviewerId: string | null) =>
    db().models.RiskReview.create({ environmentId: envId, key, status, rationale: "Single zone until the bus migration lands", reviewBy, reviewerId, notifiedAt: null });

  it("mails the reviewer once per review-by date, due today or overdue, and skips resolved and future reviews", async () => {
    const reviewer = architects[0];
    if (!reviewer) throw new Error("no architect");
    const due = await review("session-store", "2030-06-10", "accepted", reviewer.id);
    await review("late-one", "2030-06-01", "mitigating", reviewer.id);
    await review("later", "2031-01-01", "accepted", reviewer.id);
    await review("done", "2030-06-01", "resolved", reviewer.id);
    const now = new Date("2030-06-10T08:00:00Z");

    expect(await noticeReviewsDue({ now })).toBe(2);
    const mails = await deliverAll();
    expect(mails.map((m) => m.to)).toEqual(["arch-one@harbor-pantry.example", "arch-one@harbor-pantry.example"]);
    expect(mails.map((m) => m.subject).sort()).toEqual([
      "[Pinchpoint] Risk review of late-one in production overdue since 2030-06-01",
      "[Pinchpoint] Risk review of session-store in production due 2030-06-10",
    ]);
    expect(mails.find((m) => m.subject.includes("session-store"))?.text).toContain("The risk review of Session store (session-store) in Production (production) is due today, 2030-06-10.");

    // Once per date: later the same day, and the next day, nothing new.
    expect(await noticeReviewsDue({ now: new Date("2030-06-10T18:00:00Z") })).toBe(0);
    expect(await noticeReviewsDue({ now: new Date("2030-06-11T08:00:00Z") })).toBe(0);
    expect((await due.reload()).notifiedAt).toEqual(now);

    // The reviewer sets a new date: told again when it comes, not before.
    await due.update({ reviewBy: "2030-09-01" });
    expect(await noticeReviewsDue({ now: new Date("2030-08-31T08:00:00Z") })).toBe(0);
    expect(await noticeReviewsDue({ now: new Date("2030-09-01T08:00:00Z") })).toBe(1);
  });
});

describe("noticeInvite", () => {
  it("mails the invitee a one-time link made absolute with NEXTAUTH_URL", async () => {
    const saved = process.env.NEXTAUTH_URL;
    process.env.NEXTAUTH_URL = "http://127.0.0.1:3000";
    try {
      expect(await noticeInvite({ email: "new.hire@harbor-pantry.example", link: "/invite/tok123" })).toBe(1);
    } finally {
      if (saved === undefined) delete process.env.NEXTAUTH_URL;
      else process.env.NEXTAUTH_URL = saved;
    }
    const [mail] = await deliverAll();
    expect(mail?.to).toBe("new.hire@harbor-pantry.example");
    expect(mail?.text).toContain("http://127.0.0.1:3000/invite/tok123");
  });
});
