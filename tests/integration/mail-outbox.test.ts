// The outbox and its queue against real PostgreSQL and a real SMTP conversation with the local
// sink: a message and its delivery job are queued in the caller's transaction, delivered once,
// retried with the queue's backoff, given up on, never thrown.
import { createServer } from "node:net";
import { describe, expect, it } from "vitest";
import { db } from "@/models";
import { enqueueMail } from "@/lib/mail/outbox";
import { deliverDueMail } from "@/lib/jobs/mail";
import { createMailTransport } from "@/lib/mail/transport";
import { jobQueue, MAIL_RETRY_DELAY_S, MAIL_RETRY_LIMIT, QUEUES, sendJob } from "@/lib/data/job-queue";
import { mailSinkForFile, TEST_FROM as FROM } from "../support/mail-sink";
const invite = (to: string[], n = 1) => ({ to, template: "invite" as const, data: { link: `https://pp.example/invite/${n}` } });

const { transport: sinkTransport, emls } = mailSinkForFile({ maxBytes: 200_000 });

/** A port nothing listens on: bind an ephemeral one, then let it go. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  const port = (server.address() as { port: number }).port;
  await new Promise<void>((r) => server.close(() => r()));
  return port;
}

const row = (id: string) => db().models.OutboxMessage.findByPk(id, { rejectOnEmpty: true });
const job = async (messageId: string) => jobQueue().getJobById(QUEUES.mail, (await row(messageId)).jobId ?? "", { includeArchive: false });
const waiting = () => jobQueue().getQueueSize(QUEUES.mail);

describe("enqueueMail", () => {
  it("queues nothing, neither message nor job, when the caller's transaction rolls back", async () => {
    await expect(
      db().sequelize.transaction(async (transaction) => {
        await enqueueMail(invite(["rolled@back.example"]), transaction);
        throw new Error("the push failed");
      }),
    ).rejects.toThrow("the push failed");
    expect(await db().models.OutboxMessage.count()).toBe(0);
    expect(await waiting()).toBe(0);
    expect(await deliverDueMail({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(await emls()).toHaveLength(0);
  });

  it("stores rendered subject, text and HTML with lower-cased, de-duplicated recipients, and a delivery job that names only the message", async () => {
    const id = await enqueueMail(invite(["New.Person@Example.com", "new.person@example.com"]));
    const stored = await row(id ?? "");
    expect(stored).toMatchObject({ to: ["new.person@example.com"], template: "invite", status: "queued", attempts: 0, subject: "[Pinchpoint] You are invited: set your password" });
    expect(stored.text).toContain("https://pp.example/invite/1");
    expect(stored.html).toContain('href="https://pp.example/invite/1"');
    // The invite's one-time link stays in the outbox, never in the queue's tables.
    expect(await job(id ?? "")).toMatchObject({ state: "created", data: { messageId: id }, retryLimit: MAIL_RETRY_LIMIT, retryBackoff: true });
  });

  it("refuses an address that is not one, before anything is stored", async () => {
    await expect(enqueueMail(invite(["not-an-address"]))).rejects.toThrow();
    expect(await db().models.OutboxMessage.count()).toBe(0);
    expect(await waiting()).toBe(0);
  });

  it("queues a message with a dedupe key only once", async () => {
    expect(await enqueueMail({ ...invite(["a@example.com"]), dedupeKey: "k1" })).toEqual(expect.any(String));
    expect(await enqueueMail({ ...invite(["a@example.com"]), dedupeKey: "k1" })).toBeNull();
    expect(await db().models.OutboxMessage.count()).toBe(1);
    expect(await waiting()).toBe(1);
  });
});

describe("deliverDueMail with the sink", () => {
  it("delivers an .eml with the right recipients and subject, marks it sent, completes its job, and does not send it twice", async () => {
    const id = await enqueueMail(invite(["one@example.com", "two@example.com"]));
    expect(await deliverDueMail({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 1, retrying: 0, failed: 0 });
    const [mail, ...rest] = await emls();
    expect(rest).toHaveLength(0);
    expect(mail).toMatchObject({ from: "Pinchpoint <pinchpoint@harbor-pantry.example>", to: "one@example.com, two@example.com", subject: "[Pinchpoint] You are invited: set your password" });
    expect(mail?.text).toContain("https://pp.example/invite/1");
    expect(mail?.html).toContain("Set your password");
    expect(mail?.headers.get("x-pinchpoint-outbox-id")).toBe(id);
    const stored = await row(id ?? "");
    expect(stored).toMatchObject({ status: "sent", attempts: 1, lastError: null });
    expect(stored.sentAt).toBeInstanceOf(Date);
    // Delivered, the invite's link is no longer kept.
    expect(stored.text).not.toContain("https://pp.example/invite/1");
    expect(await job(id ?? "")).toMatchObject({ state: "completed" });
    expect(await deliverDueMail({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(await emls()).toHaveLength(1);
  });

  it("a job that runs again after its message went out (a worker died before recording it) sends nothing", async () => {
    const id = (await enqueueMail(invite(["once@example.com"]))) ?? "";
    await deliverDueMail({ transport: sinkTransport(), from: FROM });
    await sendJob(QUEUES.mail, { messageId: id });
    expect(await deliverDueMail({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(await emls()).toHaveLength(1);
    expect(await waiting()).toBe(0);
  });

  it("shares the queue between concurrent deliverers without sending anything twice (pg-boss fetches with SKIP LOCKED)", async () => {
    for (let i = 0; i < 30; i++) await enqueueMail(invite([`p${i}@example.com`], i));
    const reports = await Promise.all([
      deliverDueMail({ transport: sinkTransport(), from: FROM, limit: 4 }),
      deliverDueMail({ transport: sinkTransport(), from: FROM, limit: 4 }),
      deliverDueMail({ transport: sinkTransport(), from: FROM, limit: 4 }),
    ]);
    expect(reports.reduce((s, r) => s + r.sent, 0)).toBe(30);
    const recipients = (await emls()).map((m) => m.to).sort();
    expect(recipients).toHaveLength(30);
    expect(new Set(recipients).size).toBe(30);
  });

  it("leaves mail queued, without using up attempts, while no sender address is configured", async () => {
    const saved = { demo: process.env.PINCHPOINT_DEMO, from: process.env.PINCHPOINT_MAIL_FROM };
    delete process.env.PINCHPOINT_DEMO;
    delete process.env.PINCHPOINT_MAIL_FROM;
    try {
      const id = await enqueueMail(invite(["x@example.com"]));
      expect(await deliverDueMail({ transport: sinkTransport() })).toEqual({ sent: 0, retrying: 0, failed: 0 });
      expect(await row(id ?? "")).toMatchObject({ status: "queued", attempts: 0 });
      expect(await job(id ?? "")).toMatchObject({ state: "created", retryCount: 0 });
    } finally {
      if (saved.demo !== undefined) process.env.PINCHPOINT_DEMO = saved.demo;
      if (saved.from !== undefined) process.env.PINCHPOINT_MAIL_FROM = saved.from;
    }
  });
});

describe("deliverDueMail when SMTP fails", () => {
  it("retries a closed port with exponential backoff, then marks the message failed, never throwing", async () => {
    const transport = createMailTransport(`smtp://127.0.0.1:${await closedPort()}`);
    const id = (await enqueueMail(invite(["late@example.com"]))) ?? "";
    const delay = MAIL_RETRY_DELAY_S();
    for (let attempt = 1; attempt <= MAIL_RETRY_LIMIT + 1; attempt++) {
      // After the first attempt the next is not due before its backoff ends; the test takes it early.
      const report = await deliverDueMail({ transport, from: FROM, ignoreBackoff: attempt > 1 });
      const stored = await row(id);
      expect(stored.attempts).toBe(attempt);
      expect(stored.lastError).toMatch(/ECONNREFUSED/);
      if (attempt <= MAIL_RETRY_LIMIT) {
        expect(report).toEqual({ sent: 0, retrying: 1, failed: 0 });
        expect(stored.status).toBe("queued");
        // pg-boss 10, src/plans.js failJobs: start_after = now + delay·2^n/2·(1 + random), n = the retry number.
        const retry = await job(id);
        expect(retry?.state).toBe("retry");
        const waitS = (retry!.startAfter.getTime() - Date.now()) / 1000;
        const low = (delay * 2 ** attempt) / 2;
        expect(waitS).toBeGreaterThan(low - 5);
        expect(waitS).toBeLessThan(2 * low + 5);
        expect(await deliverDueMail({ transport, from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
      } else {
        expect(report).toEqual({ sent: 0, retrying: 0, failed: 1 });
        expect(stored.status).toBe("failed");
      }
    }
    // Given up for good: nothing more is tried, however late.
    expect(await deliverDueMail({ transport, from: FROM, ignoreBackoff: true })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(console.error).toHaveBeenCalledWith(expect.stringContaining(`gave up on ${id}`));
    // A failed invite keeps no copy of its link either.
    expect((await row(id)).text).not.toContain("https://pp.example/invite/1");
  });

  it("gives up at once on a permanent 5xx reply (here the sink's 552 for an oversized message)", async () => {
    const id = (await enqueueMail({ to: ["big@example.com"], template: "reviewDue", data: { environment: { slug: "p", name: "p" }, component: { key: "k", name: "k" }, status: "accepted", reviewBy: "2030-01-01", overdue: false, rationale: "r".repeat(300_000) } })) ?? "";
    expect(await deliverDueMail({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 1 });
    expect(await row(id)).toMatchObject({ status: "failed", attempts: 1, lastError: expect.stringMatching(/552|exceeds/) });
    expect(await waiting()).toBe(0);
    expect(await emls()).toHaveLength(0);
  });
});
