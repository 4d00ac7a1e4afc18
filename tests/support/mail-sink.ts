// A real SMTP sink for one integration test file: started before its tests, emptied (with the
// outbox table and the queue `mail`) before each, closed after; console warnings and errors muted per test.
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, afterEach, beforeAll, beforeEach, vi } from "vitest";
import { db } from "@/models";
import { jobQueue, QUEUES } from "@/lib/data/job-queue";
import { parseMessage } from "@/lib/mail/sink-store";
import { startMailSink, type MailSink } from "@/lib/mail/sink";
import { createMailTransport } from "@/lib/mail/transport";

export const TEST_FROM = "Pinchpoint <pinchpoint@harbor-pantry.example>";

export function mailSinkForFile({ maxBytes }: { maxBytes?: number } = {}) {
  let sink: MailSink | undefined;
  let dir = "";
  beforeAll(async () => {
    dir = await mkdtemp(path.join(tmpdir(), "pp-mail-"));
    sink = await startMailSink({ port: 0, dir, ...(maxBytes ? { maxBytes } : {}) });
  });
  afterAll(async () => {
    await sink?.close();
    await rm(dir, { recursive: true, force: true });
  });
  beforeEach(async () => {
    await db().models.OutboxMessage.destroy({ where: {} });
    await jobQueue().purgeQueue(QUEUES.mail);
    for (const n of await readdir(dir)) await rm(path.join(dir, n));
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    vi.spyOn(console, "error").mockImplementation(() => undefined);
  });
  afterEach(() => vi.restoreAllMocks());

  return {
    /** an SMTP transport to the sink */
    transport: () => createMailTransport(`smtp://127.0.0.1:${sink?.port}`),
    /** every message the sink kept, oldest first */
    async emls() {
      const names = (await readdir(dir)).filter((n) => n.endsWith(".eml")).sort();
      return Promise.all(names.map(async (n) => parseMessage(await readFile(path.join(dir, n)))));
    },
  };
}
