// Queueing e-mail. A notice renders its message and queues it in the caller's transaction (a
// rolled-back change sends nothing, a committed one cannot lose its mail); the outbox row and its
// delivery job are written by lib/data/mail-outbox.ts, and lib/jobs/mail.ts delivers them later, off
// the request path, in the worker. Delivery is at-least-once: a worker that dies between the SMTP
// server's "250 OK" and recording it sends that message again when the queue retries the job.
import { z } from "zod";
import { appUrl } from "@/lib/config";
import { insertOutboxMessage } from "@/lib/data/mail-outbox";
import type { DataTransaction } from "@/lib/data/transactions";
import { renderMail, type TemplateData, type TemplateName } from "./templates";

const recipientsSchema = z.array(z.email().max(320)).min(1).max(100);

interface EnqueueInput<T extends TemplateName> {
  to: string[];
  template: T;
  data: TemplateData<T>;
  /** a message with the same key is queued only once, ever (see notices.ts) */
  dedupeKey?: string;
}

/** Render and queue one message; returns its id, or null when the dedupe key was already used. */
export async function enqueueMail<T extends TemplateName>(input: EnqueueInput<T>, transaction?: DataTransaction): Promise<string | null> {
  const to = [...new Set(recipientsSchema.parse(input.to.map((a) => a.trim().toLowerCase())))];
  const mail = renderMail(input.template, input.data, { appUrl: appUrl() });
  return insertOutboxMessage({ to, ...mail, template: input.template, dedupeKey: input.dedupeKey ?? null }, transaction);
}
