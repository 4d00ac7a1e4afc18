// An outside example: the multi-tier guestbook from the Kubernetes documentation's tutorials
// ("Example: Deploying PHP Guestbook application with Redis"): a PHP web front end, one Redis
// leader and Redis followers. The manifests below are written out by hand from memory of the
// tutorial's six files; the frontend and redis-follower Deployments and the redis-follower
// Service were then checked against the copies the search tool holds of the tutorial's example
// files (they agreed: replicas 3 and 2, the labels and selectors, GET_HOSTS_FROM "dns").
// The expected graph comes from the tutorial's text, not from running anything:
//   - "the Redis leader is a single Pod"; the followers are "a few Redis followers, or replicas"
//     (two in the manifest); the web front end runs three replicas;
//   - the front end "is configured to connect to the redis-leader Service for write requests and
//     the redis-follower service for read requests"; the followers replicate from the leader.
// What the manifests themselves say about those connections is nothing: the front end's PHP code
// and the follower image carry the names (GET_HOSTS_FROM=dns only says "look them up in DNS").
// So the importer finds the three workloads and their Services but no needs, and says so; with
// the `pinchpoint/needs` annotation the text's graph is written down, and then the single leader
// takes everything with it (blast radius, DESIGN §3).
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { blastRadius } from "@/lib/analysis/blast-radius";
import { buildGraph } from "@/lib/analysis/graph";
import { analysisInputFromContent } from "@/lib/analysis/input";
import { mergeSources } from "@/lib/inventory/merge";
import { expectOk } from "./helpers";

const LEADER_DEPLOYMENT = `apiVersion: apps/v1
kind: Deployment
metadata:
  name: redis-leader
  labels:
    app: redis
    role: leader
    tier: backend
spec:
  replicas: 1
  selector:
    matchLabels:
      app: redis
  template:
    metadata:
      labels:
        app: redis
        role: leader
        tier: backend
    spec:
      containers:
      - name: leader
        image: "docker.io/redis:6.0.5"
        resources:
          requests:
            cpu: 100m
            memory: 100Mi
        ports:
        - containerPort: 6379
`;
const LEADER_SERVICE = `apiVersion: v1
kind: Service
metadata:
  name: redis-leader
  labels:
    app: redis
    role: leader
    tier: backend
spec:
  ports:
  - port: 6379
    targetPort: 6379
  selector:
    app: redis
    role: leader
    tier: backend
`;
const FOLLOWER_DEPLOYMENT = `apiVersion: apps/v1
kind: Deployment
metadata:
  name: redis-follower
  labels:
    app: redis
    role: follower
    tier: backend
spec:
  replicas: 2
  selector:
    matchLabels:
      app: redis
  template:
    metadata:
      labels:
        app: redis
        role: follower
        tier: backend
    spec:
      containers:
      - name: follower
        image: us-docker.pkg.dev/google-samples/containers/gke/gb-redis-follower:v2
        resources:
          requests:
            cpu: 100m
            memory: 100Mi
        ports:
        - containerPort: 6379
`;
const FOLLOWER_SERVICE = `apiVersion: v1
kind: Service
metadata:
  name: redis-follower
  labels:
    app: redis
    role: follower
    tier: backend
spec:
  ports:
    # the port that this service should serve on
  - port: 6379
  selector:
    app: redis
    role: follower
    tier: backend
`;
const FRONTEND_DEPLOYMENT = `apiVersion: apps/v1
kind: Deployment
metadata:
  name: frontend
spec:
  replicas: 3
  selector:
    matchLabels:
        app: guestbook
        tier: frontend
  template:
    metadata:
      labels:
        app: guestbook
        tier: frontend
    spec:
      containers:
      - name: php-redis
        image: us-docker.pkg.dev/google-samples/containers/gke/gb-frontend:v5
        env:
        - name: GET_HOSTS_FROM
          value: "dns"
        resources:
          requests:
            cpu: 100m
            memory: 100Mi
        ports:
        - containerPort: 80
`;
const FRONTEND_SERVICE = `apiVersion: v1
kind: Service
metadata:
  name: frontend
  labels:
    app: guestbook
    tier: frontend
spec:
  # if your cluster supports it, uncomment the following to automatically create
  # an external load-balanced IP for the frontend service.
  # type: LoadBalancer
  ports:
    # the port that this service should serve on
  - port: 80
  selector:
    app: guestbook
    tier: frontend
`;

const guestbook = (annotate: boolean) => {
  const note = (doc: string, needs: string) => (annotate ? doc.replace(/^metadata:\n/m, `metadata:\n  annotations:\n    pinchpoint/needs: "${needs}"\n`) : doc);
  return [LEADER_DEPLOYMENT, LEADER_SERVICE, note(FOLLOWER_DEPLOYMENT, "redis-leader"), FOLLOWER_SERVICE, note(FRONTEND_DEPLOYMENT, "redis-leader, redis-follower"), FRONTEND_SERVICE].join("---\n");
};
const push = (annotate: boolean) => expectOk(importInventory({ format: "kubernetes", body: guestbook(annotate), source: "guestbook" }));

describe("the guestbook tutorial (Kubernetes documentation), written out from memory", () => {
  it("gives the three tiers with the tutorial's replica counts, each Service linked to its Deployment", () => {
    const inv = push(false);
    expect(inv.components.map((c) => [c.key, c.name, c.kind, c.replicas])).toEqual([
      ["redis-leader", "default/redis-leader", "service", 1],
      ["redis-follower", "default/redis-follower", "service", 2],
      ["frontend", "default/frontend", "service", 3],
    ]);
    // The leader Deployment's own selector (app: redis) would take the followers' Pods too; the
    // Services select by role, so each Service reaches exactly one Deployment and no warning says otherwise.
    expect(inv.warnings.some((w) => /selects no workload/.test(w.message))).toBe(false);
    // `redis` is both backends' app label, so neither takes it as an alias; `guestbook` is the front end's alone.
    expect(inv.components.map((c) => c.aliases)).toEqual([[], [], ["guestbook"]]);
  });

  it("finds no needs, because the names are inside the images, and says how to declare them", () => {
    const inv = push(false);
    expect(inv.components.flatMap((c) => c.needs)).toEqual([]);
    expect(inv.warnings.map((w) => w.message)).toEqual([expect.stringMatching(/the 3 components have no needs\. Names built into images cannot be seen; declare them with the pinchpoint\/needs annotation/)]);
  });

  it("with the text's connections declared, the graph is the tutorial's and the one leader takes everything down", () => {
    const inv = push(true);
    const edges = inv.components.flatMap((c) => c.needs.map((n) => `${c.key} → ${n.type === "single" ? n.key : n.keys.join("|")} (${n.strength})`));
    expect(edges).toEqual(["redis-follower → redis-leader (hard)", "frontend → redis-leader (hard)", "frontend → redis-follower (hard)"]);
    const content = mergeSources({ existing: { components: [], dependencies: [] }, source: "guestbook", incoming: inv }).content;
    const graph = buildGraph(analysisInputFromContent(content));
    const down = (key: string) => blastRadius(graph, { components: [graph.indexOf.get(key)!] }).down.map((i) => graph.keys[i]).sort();
    expect(down("redis-leader")).toEqual(["frontend", "redis-follower", "redis-leader"]);
    expect(down("redis-follower")).toEqual(["frontend", "redis-follower"]);
    expect(down("frontend")).toEqual(["frontend"]);
  });
});
