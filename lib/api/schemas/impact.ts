// The impact of a proposed change (lib/impact/report.ts builds it): what a dry run with
// impact=true answers, and what the imports screen shows before "Push".
import { z } from "zod";
import { POLICY_RULES } from "@/lib/impact/policies";
import { filePositionSchema, tierSchema } from "./common";

const componentRef = { key: z.string(), name: z.string(), tier: tierSchema.nullable(), team: z.string().nullable() };
const needRef = { from: z.string(), to: z.string() };
const sideScore = z.object({ pinchScore: z.number(), rank: z.int() }).nullable();
const sideBlast = z.object({ down: z.int(), degraded: z.int() }).nullable();

const blastEntry = z.object({
  ...componentRef,
  before: sideBlast,
  after: sideBlast,
  newlyDown: z.array(z.string()).nullable(),
  noLongerDown: z.array(z.string()).nullable(),
  newlyDownTotal: z.int(),
  noLongerDownTotal: z.int(),
});

const policyFindingSchema = z.object({ message: z.string(), key: z.string().optional(), need: z.object(needRef).optional(), at: filePositionSchema.optional() });

const policyResultSchema = z.object({
  rule: z.enum(POLICY_RULES),
  title: z.string(),
  enabled: z.boolean(),
  severity: z.enum(["warn", "block"]),
  parameter: z.number().nullable(),
  status: z.enum(["pass", "fail", "off"]),
  findings: z.array(policyFindingSchema),
  findingsTotal: z.int(),
});

export const impactReportSchema = z.object({
  environment: z.string(),
  link: z.string(),
  basis: z.object({ snapshot: z.int().nullable(), analysis: z.enum(["stored", "recomputed", "empty"]), view: z.string(), exactBetweenness: z.boolean() }),
  changed: z.boolean(),
  blocked: z.boolean(),
  headline: z.string(),
  summary: z.object({
    changedComponents: z.int(),
    moved: z.int(),
    articulationAdded: z.int(),
    articulationRemoved: z.int(),
    bridgesAdded: z.int(),
    bridgesRemoved: z.int(),
    hardCyclesAdded: z.int(),
    hardCyclesRemoved: z.int(),
    tier1BlastChanged: z.int(),
    downGrowth: z.int(),
    singlePointNeeds: z.int(),
    dominatorEntriesChanged: z.int(),
    policiesFailed: z.int(),
    policiesBlocking: z.int(),
  }),
  moved: z.array(z.object({ ...componentRef, before: sideScore, after: sideScore })),
  articulation: z.object({ added: z.array(z.object(componentRef)), removed: z.array(z.object(componentRef)) }),
  bridges: z.object({ added: z.array(z.tuple([z.string(), z.string()])), removed: z.array(z.tuple([z.string(), z.string()])) }),
  hardCycles: z.object({ added: z.array(z.object({ members: z.array(z.string()), closedBy: z.array(z.object(needRef)) })), removed: z.array(z.array(z.string())) }),
  tier1Blast: z.array(blastEntry),
  downGrowth: z.array(blastEntry),
  singlePointNeeds: z.array(
    z.object({
      ...needRef,
      reason: z.enum(["new-need", "now-hard", "now-tier-1", "now-single-point"]),
      target: z.object({ replicas: z.int(), zones: z.array(z.string()), undeclared: z.boolean() }),
      at: filePositionSchema.optional(),
    }),
  ),
  dominators: z.object({
    entries: z.array(
      z.object({
        entry: z.string(),
        status: z.enum(["changed", "new-entry", "no-longer-entry"]),
        added: z.array(z.object({ key: z.string(), dominates: z.int() })),
        removed: z.array(z.object({ key: z.string(), dominates: z.int() })),
        addedTotal: z.int(),
        removedTotal: z.int(),
      }),
    ),
    entriesChecked: z.int(),
    entriesTotal: z.int(),
  }),
  policies: z.array(policyResultSchema),
  /** milliseconds per step of the comparison */
  timings: z.record(z.string(), z.number()),
});
export type ImpactReport = z.infer<typeof impactReportSchema>;
