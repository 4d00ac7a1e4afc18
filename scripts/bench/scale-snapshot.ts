// A generated graph written straight into the tables as one snapshot of a new environment, with its
// analysis queued: how the scale bench and the analysis-at-scale integration test start (pushing
// 100,000 components through the API is the push bench's business, not theirs).
import { db } from "../../models";
import { queueAnalysis } from "../../lib/data/analysis-runs";
import type { AnalysisInput } from "../../lib/analysis/types";
import { snapshotHash, type SnapshotContent } from "../../lib/inventory/snapshot";

export async function writeScaleSnapshot({ slug, name, input, actor }: { slug: string; name: string; input: AnalysisInput; actor: string }): Promise<{ environmentId: string; snapshotId: string }> {
  const { models } = db();
  const env = await models.Environment.create({ slug, name });
  const content: SnapshotContent = {
    components: input.nodes.map((n) => ({ key: n.key, name: n.key, kind: "service", team: n.team, tier: n.tier, replicas: n.replicas, zones: n.zones, tags: [], links: {}, source: "scale" })),
    dependencies: input.edges.map((e) => ({ from: e.from, to: e.to, strength: e.strength, group: e.group, via: null, source: "scale" })),
  };
  const snap = await models.Snapshot.create({
    environmentId: env.id,
    number: 1,
    hash: snapshotHash(content),
    content,
    componentCount: content.components.length,
    dependencyCount: content.dependencies.length,
    undeclaredCount: 0,
    sourceName: "scale",
    format: "pinchpoint",
    actorLabel: actor,
  });
  await queueAnalysis({ environmentId: env.id, snapshotId: snap.id });
  return { environmentId: env.id, snapshotId: snap.id };
}
