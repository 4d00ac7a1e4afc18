// The response of GET /api/health (lib/data/health.ts builds it; the overview reads it).
import { z } from "zod";

const workerHealthSchema = z.object({
  status: z.enum(["ok", "missing", "never"]),
  live: z.number().int(),
  lastSeenAt: z.string().nullable(),
  secondsSinceSeen: z.number().nullable(),
});

export const healthResponseSchema = z.object({
  status: z.enum(["ok", "degraded", "unavailable"]),
  app: z.object({ uptimeSeconds: z.number(), pid: z.number() }),
  database: z.object({ status: z.enum(["ok", "unreachable"]), latencyMs: z.number().nullable(), message: z.string().optional() }),
  worker: workerHealthSchema.nullable(),
  queue: z.object({ analysisQueued: z.number(), analysisRunning: z.number(), oldestQueuedSeconds: z.number().nullable(), mailQueued: z.number() }).nullable(),
});
export type HealthResponse = z.infer<typeof healthResponseSchema>;
