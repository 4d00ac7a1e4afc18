// The weekly risk digest end to end: analysed snapshots and reviews written into the tables, the
// notice queues one message per active architect, the queue delivers them to the SMTP sink, and
// what arrives names the movers, the overdue reviews and the new single points of failure. Metrics
// rows are written directly, so which component moves is set by the test, not by the analysis.
import { randomBytes } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "@/models";
import { noticeRiskDigest } from "@/lib/mail/notices";
import { deliverDueMail } from "@/lib/jobs/mail";
import { createUser, type TestUser } from "../support/api";
import { mailSinkForFile, TEST_FROM } from "../support/mail-sink";

const sink = mailSinkForFile();
const NOW = new Date("2030-06-12T07:00:00Z");
const DAY = 86_400_000;
let envId: string;
let reviewer: TestUser;

/** An analysed snapshot `daysAgo` before NOW with metrics rows [key, pinch score, competition rank, single point, blast radius down]. */
async function analysedSnapshot(number: number, daysAgo: number, rows: [string, number, number, boolean, number][]) {
  const { Snapshot, AnalysisRun, ComponentMetric } = db().models;
  const snapshot = await Snapshot.create({
    environmentId: envId,
    number,
    hash: randomBytes(32).toString("hex"),
    content: { components: [], dependencies: [] },
    componentCount: rows.length,
    dependencyCount: 0,
    undeclaredCount: 0,
    sourceName: "test",
    format: "pinchpoint",
    actorLabel: "test",
  });
  await db().sequelize.query("UPDATE snapshots SET created_at = :at WHERE id = :id", { replacements: { at: new Date(NOW.getTime() - daysAgo * DAY), id: snapshot.id } });
  await AnalysisRun.create({ environmentId: envId, snapshotId: snapshot.id, status: "done", phase: "done", lockedBy: null, heartbeatAt: null, startedAt: null, finishedAt: new Date(), error: null, exact: true, sampleSize: null, timings: null, graph: null });
  await ComponentMetric.bulkCreate(
    rows.map(([key, pinchScore, rank, singlePoint, blastDown]) => ({
      snapshotId: snapshot.id,
      key,
      name: key.toUpperCase(),
      kind: "service" as const,
      team: "storefront",
      tier: 1 as const,
      betweenness: 0,
      pagerank: 0,
      eigenvector: 0,
      clustering: 0,
      articulation: false,
      inCycle: false,
      blastDown,
      blastDegraded: 0,
      pinchScore,
      rank,
      rankPinch: rank,
      singlePoint,
    })),
  );
}

beforeAll(async () => {
  const { Environment, Team } = db().models;
  envId = (await Environment.create({ slug: "production", name: "Production", pinchWeights: null })).id;
  // An environment with no analysed snapshot says nothing.
  await Environment.create({ slug: "staging", name: "Staging", pinchWeights: null });
  await Team.create({ slug: "storefront", name: "Storefront", email: "storefront@harbor-pantry.example", oncall: null, description: null });
  reviewer = await createUser("architect", "arch-one@harbor-pantry.example");
  await createUser("architect", "arch-two@harbor-pantry.example");
  const retired = await createUser("architect", "arch-retired@harbor-pantry.example");
  await db().models.User.update({ active: false }, { where: { id: retired.id } });
  await createUser("lead", "lead@harbor-pantry.example");

  // Nine days ago (the baseline: the newest analysed snapshot at least a week old), and a snapshot
  // from within the week that the digest passes over.
  await analysedSnapshot(1, 9, [["checkout", 50, 1, false, 20], ["session-store", 30, 2, false, 12], ["search", 10, 3, false, 5], ["bus", 5, 4, true, 0]]);
  await analysedSnapshot(2, 4, [["checkout", 45, 1, false, 20], ["session-store", 35, 2, false, 12], ["search", 10, 3, false, 5], ["bus", 5, 4, true, 0]]);
  // Yesterday: session-store +15 overtakes checkout −10; search moves by 0.05 (rounding, not named);
  // bus, a single instance all along, now takes three components down; ledger is new and single.
  await analysedSnapshot(3, 1, [["session-store", 45, 1, true, 12], ["checkout", 40, 2, false, 20], ["search", 10.05, 3, false, 5], ["bus", 5, 4, true, 3], ["ledger", 2, 5, true, 2]]);
  await db().models.ComponentAnnotation.create({ environmentId: envId, key: "ledger", ownerTeam: "storefront", notes: null, updatedBy: null });

  const review = (key: string, reviewBy: string, status: "accepted" | "mitigating" | "resolved") =>
    db().models.RiskReview.create({ environmentId: envId, key, status, rationale: "until the migration lands", reviewBy, reviewerId: reviewer.id, notifiedAt: null });
  await review("checkout", "2030-06-01", "accepted"); // overdue
  await review("search", "2030-05-01", "resolved"); // resolved: never overdue
  await review("bus", "2030-06-12", "mitigating"); // due today: not yet overdue
});

describe("noticeRiskDigest", () => {
  it("mails every active architect one digest of the movers, overdue reviews and new single points, through the queue", async () => {
    expect(await noticeRiskDigest({ now: NOW })).toBe(2);
    expect(await deliverDueMail({ transport: sink.transport(), from: TEST_FROM })).toEqual({ sent: 2, retrying: 0, failed: 0 });
    const mails = await sink.emls();
    expect(mails.map((m) => m.to).sort()).toEqual(["arch-one@harbor-pantry.example", "arch-two@harbor-pantry.example"]);
    const mail = mails[0]!;
    expect(mail.subject).toBe("[Pinchpoint] Weekly risk digest, 2030-W24: 2 movers, 1 overdue review, 3 new single points of failure");
    const text = mail.text ?? "";
    expect(text).toContain("Production (production): snapshot 3 against snapshot 1");
    // Largest change first; ranks are the stored competition ranks by pinch score.
    expect(text).toContain("Top movers in pinch score:\n  session-store (SESSION-STORE): 30.0 → 45.0 (+15.0), rank #2 → #1\n  checkout (CHECKOUT): 50.0 → 40.0 (−10.0), rank #1 → #2");
    expect(text).not.toContain("search (SEARCH): 10.0");
    // Reviews are named by the component as the inventory has it (no components rows here: the key).
    expect(text).toContain("Overdue risk reviews:\n  checkout: accepted, review by 2030-06-01, reviewer arch-one@harbor-pantry.example");
    // session-store was not single before; bus was, but took nothing down; ledger is new (owned through its annotation).
    expect(text).toContain(
      "New single points of failure:\n  session-store (SESSION-STORE): takes 12 down, team storefront\n  bus (BUS): takes 3 down, team storefront\n  ledger (LEDGER): takes 2 down, team storefront",
    );
    expect(text).toContain("/environments/production/pinch-points");
    expect(text).not.toContain("staging");
    expect(text).toContain("only as good as the inventory");
    expect(mail.html).toContain('href="http://127.0.0.1:3000/environments/production/components/session-store"');
    // One digest per week: the scheduler firing again in the same week queues nothing.
    expect(await noticeRiskDigest({ now: new Date(NOW.getTime() + 3_600_000) })).toBe(0);
  });

  it("with nothing to say anywhere, sends nothing", async () => {
    // One analysed snapshot left (nothing to compare it with) and every review resolved.
    await db().sequelize.query("DELETE FROM analysis_runs WHERE snapshot_id IN (SELECT id FROM snapshots WHERE number < 3 AND environment_id = :envId)", { replacements: { envId } });
    await db().models.RiskReview.update({ status: "resolved" }, { where: { environmentId: envId } });
    expect(await noticeRiskDigest({ now: new Date(NOW.getTime() + 14 * DAY) })).toBe(0);
  });
});
