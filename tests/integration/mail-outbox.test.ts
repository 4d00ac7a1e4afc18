// The outbox against real PostgreSQL and a real SMTP conversation with the local sink: queued in
// the caller's transaction, delivered once, retried with backoff, given up on, never thrown.
import { createServer } from "node:net";
import { describe, expect, it } from "vitest";
import { db } from "@/models";
import { BACKOFF_MS, deliverOutbox, enqueueMail, MAX_ATTEMPTS } from "@/lib/mail/outbox";
import { createMailTransport } from "@/lib/mail/transport";
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


describe("enqueueMail", () => {
  it("queues nothing when the caller's transaction rolls back, so a failed change sends no mail", async () => {
    await expect(
      db().sequelize.transaction(async (transaction) => {
        await enqueueMail(invite(["rolled@back.example"]), transaction);
        throw new Error("the push failed");
      }),
    ).rejects.toThrow("the push failed");
    expect(await db().models.OutboxMessage.count()).toBe(0);
    expect(await deliverOutbox({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(await emls()).toHaveLength(0);
  });

  it("stores rendered subject, text and HTML with lower-cased, de-duplicated recipients", async () => {
    const id = await enqueueMail(invite(["New.Person@Example.com", "new.person@example.com"]));
    const stored = await row(id ?? "");
    expect(stored).toMatchObject({ to: ["new.person@example.com"], template: "invite", status: "queued", attempts: 0, subject: "[Pinchpoint] You are invited: set your password" });
    expect(stored.text).toContain("https://pp.example/invite/1");
    expect(stored.html).toContain('href="https://pp.example/invite/1"');
  });

  it("refuses an address that is not one, before anything is stored", async () => {
    await expect(enqueueMail(invite(["not-an-address"]))).rejects.toThrow();
    expect(await db().models.OutboxMessage.count()).toBe(0);
  });

  it("queues a message with a dedupe key only once", async () => {
    expect(await enqueueMail({ ...invite(["a@example.com"]), dedupeKey: "k1" })).toEqual(expect.any(String));
    expect(await enqueueMail({ ...invite(["a@example.com"]), dedupeKey: "k1" })).toBeNull();
    expect(await db().models.OutboxMessage.count()).toBe(1);
  });
});

describe("deliverOutbox with the sink", () => {
  it("delivers an .eml with the right recipients and subject, marks it sent, and does not send it twice", async () => {
    const id = await enqueueMail(invite(["one@example.com", "two@example.com"]));
    expect(await deliverOutbox({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 1, retrying: 0, failed: 0 });
    const [mail, ...rest] = await emls();
    expect(rest).toHaveLength(0);
    expect(mail).toMatchObject({ from: FROM, to: "one@example.com, two@example.com", subject: "[Pinchpoint] You are invited: set your password" });
    expect(mail?.text).toContain("https://pp.example/invite/1");
    expect(mail?.html).toContain("Set your password");
    expect(mail?.headers.get("x-pinchpoint-outbox-id")).toBe(id);
    const stored = await row(id ?? "");
    expect(stored).toMatchObject({ status: "sent", attempts: 1, lastError: null });
    expect(stored.sentAt).toBeInstanceOf(Date);
    expect(await deliverOutbox({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(await emls()).toHaveLength(1);
  });

  it("shares the queue between concurrent deliverers without sending anything twice (FOR UPDATE SKIP LOCKED)", async () => {
    for (let i = 0; i < 30; i++) await enqueueMail(invite([`p${i}@example.com`], i));
    const reports = await Promise.all([
      deliverOutbox({ transport: sinkTransport(), from: FROM, limit: 4 }),
      deliverOutbox({ transport: sinkTransport(), from: FROM, limit: 4 }),
      deliverOutbox({ transport: sinkTransport(), from: FROM, limit: 4 }),
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
      expect(await deliverOutbox({ transport: sinkTransport() })).toEqual({ sent: 0, retrying: 0, failed: 0 });
      expect(await row(id ?? "")).toMatchObject({ status: "queued", attempts: 0 });
    } finally {
      if (saved.demo !== undefined) process.env.PINCHPOINT_DEMO = saved.demo;
      if (saved.from !== undefined) process.env.PINCHPOINT_MAIL_FROM = saved.from;
    }
  });
});

describe("deliverOutbox when SMTP fails", () => {
  it("retries a closed port after 1, 5, 30 and 120 minutes, then marks the message failed, never throwing", async () => {
    const transport = createMailTransport(`smtp://127.0.0.1:${await closedPort()}`);
    const id = (await enqueueMail(invite(["late@example.com"]))) ?? "";
    let now = new Date(Date.now() + 1000);
    for (let attempt = 1; attempt <= MAX_ATTEMPTS; attempt++) {
      const report = await deliverOutbox({ transport, from: FROM, now });
      const stored = await row(id);
      expect(stored.attempts).toBe(attempt);
      expect(stored.lastError).toMatch(/ECONNREFUSED/);
      if (attempt < MAX_ATTEMPTS) {
        expect(report).toEqual({ sent: 0, retrying: 1, failed: 0 });
        expect(stored.status).toBe("queued");
        const wait = BACKOFF_MS[attempt - 1] ?? 0;
        expect(stored.nextAttemptAt.getTime()).toBe(now.getTime() + wait);
        // Not due a moment before the backoff ends.
        expect(await deliverOutbox({ transport, from: FROM, now: new Date(now.getTime() + wait - 1000) })).toEqual({ sent: 0, retrying: 0, failed: 0 });
        now = new Date(now.getTime() + wait);
      } else {
        expect(report).toEqual({ sent: 0, retrying: 0, failed: 1 });
        expect(stored.status).toBe("failed");
      }
    }
    // Given up for good: nothing more is tried, however late.
    expect(await deliverOutbox({ transport, from: FROM, now: new Date(now.getTime() + 86_400_000) })).toEqual({ sent: 0, retrying: 0, failed: 0 });
    expect(console.error).toHaveBeenCalledWith(expect.stringContaining(`gave up on ${id}`));
  });

  it("gives up at once on a permanent 5xx reply (here the sink's 552 for an oversized message)", async () => {
    const id = (await enqueueMail({ to: ["big@example.com"], template: "reviewDue", data: { environment: { slug: "p", name: "p" }, component: { key: "k", name: "k" }, status: "accepted", reviewBy: "2030-01-01", overdue: false, rationale: "r".repeat(300_000) } })) ?? "";
    expect(await deliverOutbox({ transport: sinkTransport(), from: FROM })).toEqual({ sent: 0, retrying: 0, failed: 1 });
    expect(await row(id)).toMatchObject({ status: "failed", attempts: 1, lastError: expect.stringMatching(/552|exceeds/) });
    expect(await emls()).toHaveLength(0);
  });
});
