// The Kubernetes importer, one rule per test, each on a minimal manifest written for the test.
// Expected values are derived by hand from the Kubernetes documentation, named beside each check:
//   "Service" (selectors, ExternalName, headless Services, the Environment variables section),
//   "DNS for Services and Pods" and the DNS-based service discovery specification (record names,
//   the Pod's search list `<ns>.svc.<domain> svc.<domain> <domain>`), "Ingress", "Gateway API
//   HTTPRoute" / GRPCRoute (parentRefs and backendRefs, namespaces defaulting to the route's),
//   "Init Containers", "Labels and Selectors", "Define Dependent Environment Variables", and the
//   API reference of apps/v1, batch/v1, core/v1, autoscaling/v2, policy/v1 and networking.k8s.io/v1.
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import type { InventoryComponent, KubernetesImportOptions } from "@/lib/inventory/types";
import { expectIssues, expectOk, located } from "./helpers";

const k8s = (body: string, kubernetes?: KubernetesImportOptions, positions = false) =>
  importInventory({ format: "kubernetes", body, source: "cluster-dump", kubernetes, positions });

const byKey = (components: InventoryComponent[], key: string): InventoryComponent => {
  const c = components.find((x) => x.key === key);
  if (!c) throw new Error(`no component ${key} among ${components.map((x) => x.key).join(", ")}`);
  return c;
};
const targets = (c: InventoryComponent) => c.needs.map((n) => (n.type === "single" ? n.key : `any_of(${n.keys.join(",")})`));

interface PodOpts {
  ns?: string;
  labels?: Record<string, string>;
  env?: string;
  args?: string[];
  command?: string[];
  init?: string;
  extraSpec?: string;
  replicas?: number;
  meta?: string;
  kind?: string;
  apiVersion?: string;
}

/** A Deployment (or another workload kind with the same shape) in YAML. */
function workload(name: string, o: PodOpts = {}): string {
  const labels = o.labels ?? { app: name };
  const labelLines = Object.entries(labels).map(([k, v]) => `        ${k}: "${v}"`).join("\n");
  return `apiVersion: ${o.apiVersion ?? "apps/v1"}
kind: ${o.kind ?? "Deployment"}
metadata:
  name: ${name}
  namespace: ${o.ns ?? "shop"}
${o.meta ?? ""}spec:
${o.replicas !== undefined ? `  replicas: ${o.replicas}\n` : ""}  selector:
    matchLabels:
${Object.entries(labels).map(([k, v]) => `      ${k}: "${v}"`).join("\n")}
  template:
    metadata:
      labels:
${labelLines}
    spec:
${o.extraSpec ?? ""}${o.init ?? ""}      containers:
        - name: main
          image: example.invalid/${name}:1
${o.env ? `          env:\n${o.env}` : ""}${o.args ? `          args: ${JSON.stringify(o.args)}\n` : ""}${o.command ? `          command: ${JSON.stringify(o.command)}\n` : ""}`;
}

function service(name: string, o: { ns?: string; selector?: Record<string, string> | null; extra?: string } = {}): string {
  const sel = o.selector === null ? "" : `  selector:\n${Object.entries(o.selector ?? { app: name }).map(([k, v]) => `    ${k}: "${v}"`).join("\n")}\n`;
  return `apiVersion: v1
kind: Service
metadata:
  name: ${name}
  namespace: ${o.ns ?? "shop"}
spec:
${sel}${o.extra ?? ""}  ports:
    - port: 80
`;
}

const env = (pairs: Record<string, string>) =>
  Object.entries(pairs)
    .map(([k, v]) => `            - name: ${k}\n              value: "${v}"\n`)
    .join("");
const docs = (...parts: string[]) => parts.join("---\n");

describe("kubernetes importer: input forms", () => {
  const deployment = workload("orders");
  it("multi-document YAML, a YAML List, a JSON List and a JSON array read the same objects", () => {
    const multi = expectOk(k8s(docs(deployment, service("orders"))));
    const asList = `apiVersion: v1\nkind: List\nitems:\n${[deployment, service("orders")].map((d) => `  - ${d.trimEnd().split("\n").join("\n    ")}`).join("\n")}\n`;
    const list = expectOk(k8s(asList));
    const obj = {
      apiVersion: "apps/v1",
      kind: "Deployment",
      metadata: { name: "orders", namespace: "shop" },
      spec: { selector: { matchLabels: { app: "orders" } }, template: { metadata: { labels: { app: "orders" } }, spec: { containers: [{ name: "main" }] } } },
    };
    const jsonList = expectOk(k8s(JSON.stringify({ apiVersion: "v1", kind: "DeploymentList", items: [obj] })));
    const jsonArray = expectOk(k8s(JSON.stringify([obj])));
    for (const inv of [multi, list, jsonList, jsonArray]) {
      expect(inv.components.map((c) => [c.key, c.name, c.kind])).toEqual([["orders", "shop/orders", "service"]]);
    }
  });

  it("unknown kinds are skipped and counted in one warning; a kind under another API group is unknown", () => {
    const body = docs(
      workload("orders"),
      "apiVersion: v1\nkind: ServiceAccount\nmetadata: {name: a}\n",
      "apiVersion: v1\nkind: ServiceAccount\nmetadata: {name: b}\n",
      "apiVersion: networking.istio.io/v1\nkind: Gateway\nmetadata: {name: mesh}\n",
      "# only a comment\n",
    );
    const inv = expectOk(k8s(body));
    expect(inv.components.map((c) => c.key)).toEqual(["orders"]);
    expect(inv.warnings).toEqual([expect.objectContaining({ message: "3 objects of kinds this importer does not read were skipped: ServiceAccount ×2, Gateway (networking.istio.io) ×1" })]);
  });

  it("syntax errors, bad field types and objects without kind are located; nothing is imported", () => {
    expect(expectIssues(k8s("apiVersion: v1\nkind: Service\nmetadata:\n  name: x\n  name: y\n"), 422)).toEqual([
      expect.objectContaining({ line: 5, message: expect.stringMatching(/duplicate mapping key/) }),
    ]);
    const bad = docs(workload("orders", { replicas: 3 }).replace("replicas: 3", 'replicas: "three"'), "apiVersion: v1\nmetadata: {name: x}\n");
    expect(expectIssues(k8s(bad), 422)).toEqual([
      located("documents[0].spec.replicas", 7, 3, /invalid replicas "three"/),
      located("documents[1].kind", 20, 1, /needs a kind/),
    ]);
  });

  it("needs a source from the push; settings that do not fit are refused", () => {
    const noSource = importInventory({ format: "kubernetes", body: workload("a") });
    expect(expectIssues(noSource, 422)[0]?.message).toMatch(/names no source/);
    const issues = expectIssues(k8s(workload("a"), { clusterDomain: "not a domain", teamKey: "-bad", teams: { shop: "Not A Slug" } }), 422);
    expect(issues.map((i) => i.path)).toEqual(["cluster_domain", "team_key", "teams"]);
  });

  it("an alias bomb is refused with 413 while it is read", () => {
    const levels = ["a: &a [x,x,x,x,x,x,x,x,x,x]"];
    for (let i = 1; i < 7; i++) levels.push(`l${i}: &l${i} [${Array(10).fill(i === 1 ? "*a" : `*l${i - 1}`).join(",")}]`);
    expect(expectIssues(k8s(`${levels.join("\n")}\n`), 413)[0]?.message).toMatch(/aliases expand to more than/);
  });
});

describe("kubernetes importer: components", () => {
  it("workload kinds: Deployments, StatefulSets, DaemonSets, owner-less ReplicaSets, Jobs and bare Pods; CronJobs and Jobs are kind job", () => {
    const cron = `apiVersion: batch/v1
kind: CronJob
metadata: {name: nightly-report, namespace: shop}
spec:
  schedule: "0 3 * * *"
  jobTemplate:
    spec:
      template:
        spec:
          containers: [{name: main, image: x}]
`;
    const pod = "apiVersion: v1\nkind: Pod\nmetadata: {name: debug-shell, namespace: shop}\nspec:\n  containers: [{name: main, image: x}]\n";
    const ownedPod = "apiVersion: v1\nkind: Pod\nmetadata:\n  name: orders-5d9f-abcde\n  namespace: shop\n  ownerReferences: [{kind: ReplicaSet, name: orders-5d9f, apiVersion: apps/v1, uid: u}]\nspec:\n  containers: [{name: main}]\n";
    const ownedRs = workload("orders-5d9f", { kind: "ReplicaSet", meta: "  ownerReferences: [{kind: Deployment, name: orders, apiVersion: apps/v1, uid: u}]\n" });
    const job = "apiVersion: batch/v1\nkind: Job\nmetadata: {name: migrate, namespace: shop}\nspec:\n  template:\n    spec:\n      containers: [{name: main}]\n";
    const inv = expectOk(
      k8s(docs(workload("orders"), workload("ledger-db", { kind: "StatefulSet" }), workload("log-agent", { kind: "DaemonSet" }), workload("legacy-rs", { kind: "ReplicaSet" }), ownedRs, cron, job, pod, ownedPod)),
    );
    expect(inv.components.map((c) => [c.key, c.kind, c.tags[0]])).toEqual([
      ["orders", "service", "deployment"],
      ["ledger-db", "service", "statefulset"],
      ["log-agent", "service", "daemonset"],
      ["legacy-rs", "service", "replicaset"],
      ["nightly-report", "job", "cronjob"],
      ["migrate", "job", "job"],
      ["debug-shell", "service", "pod"],
    ]);
    expect(inv.warnings.map((w) => w.message)).toContain("objects made by another object (ownerReferences) are read through their owner and were skipped: ReplicaSet ×1, Pod ×1");
  });

  it("keys: the name when unique, name.namespace when the name is in several namespaces, a kind suffix within one namespace", () => {
    const ingress = "apiVersion: networking.k8s.io/v1\nkind: Ingress\nmetadata: {name: web, namespace: shop}\nspec:\n  defaultBackend: {service: {name: web, port: {number: 80}}}\n";
    const inv = expectOk(k8s(docs(workload("web"), service("web"), ingress, workload("api", { ns: "shop" }), workload("api", { ns: "blog" }))));
    expect(inv.components.map((c) => [c.key, c.name])).toEqual([
      ["web", "shop/web"],
      ["api.shop", "shop/api"],
      ["api.blog", "blog/api"],
      ["web-ingress", "shop/web"],
    ]);
    expect(targets(byKey(inv.components, "web-ingress"))).toEqual(["web"]);
  });

  it("keys never collide silently: a clash the rules cannot settle is an error at both objects", () => {
    const ingress = "apiVersion: networking.k8s.io/v1\nkind: Ingress\nmetadata: {name: web, namespace: shop}\nspec: {}\n";
    const issues = expectIssues(k8s(docs(workload("web"), ingress, workload("web-ingress"))), 422);
    expect(issues).toHaveLength(2);
    for (const i of issues) expect(i.message).toMatch(/Ingress shop\/web and Deployment shop\/web-ingress would all get component key "web-ingress.shop"|Deployment shop\/web-ingress and Ingress shop\/web would all get component key "web-ingress.shop"/);
  });

  it("replicas: spec.replicas, the API default 1, 0 kept as 1 (scaled down), and an HPA's minReplicas wins", () => {
    const hpa = "apiVersion: autoscaling/v2\nkind: HorizontalPodAutoscaler\nmetadata: {name: api, namespace: shop}\nspec:\n  scaleTargetRef: {apiVersion: apps/v1, kind: Deployment, name: api}\n  minReplicas: 4\n  maxReplicas: 10\n";
    const inv = expectOk(k8s(docs(workload("api", { replicas: 2 }), hpa, workload("web", { replicas: 3 }), workload("idle", { replicas: 0 }), workload("plain"))));
    expect(inv.components.map((c) => [c.key, c.replicas])).toEqual([["api", 4], ["web", 3], ["idle", 1], ["plain", 1]]);
    expect(byKey(inv.components, "idle").tags).toContain("scaled-to-zero");
  });

  it("zones: node affinity on topology.kubernetes.io/zone pins them (one zone: single-zone); a zone spread uses the Nodes' zones", () => {
    const pinned = (values: string[]) => `      affinity:
        nodeAffinity:
          requiredDuringSchedulingIgnoredDuringExecution:
            nodeSelectorTerms:
              - matchExpressions:
                  - {key: topology.kubernetes.io/zone, operator: In, values: ${JSON.stringify(values)}}
`;
    const spread = "      topologySpreadConstraints:\n        - {maxSkew: 1, topologyKey: topology.kubernetes.io/zone, whenUnsatisfiable: DoNotSchedule}\n";
    const node = (n: string, z: string) => `apiVersion: v1\nkind: Node\nmetadata:\n  name: ${n}\n  labels: {topology.kubernetes.io/zone: ${z}}\n`;
    const body = docs(
      workload("east-only", { extraSpec: pinned(["zone-a"]), replicas: 3 }),
      workload("two-zones", { extraSpec: pinned(["zone-a", "zone-b"]), replicas: 2 }),
      workload("spread", { extraSpec: spread, replicas: 3 }),
      workload("by-selector", { extraSpec: "      nodeSelector: {topology.kubernetes.io/zone: zone-c}\n" }),
      node("n1", "zone-a"),
      node("n2", "zone-b"),
      node("n3", "zone-c"),
    );
    const inv = expectOk(k8s(body));
    expect(inv.components.map((c) => [c.key, c.zones, c.tags.filter((t) => t.includes("zone"))])).toEqual([
      ["east-only", ["zone-a"], ["single-zone"]],
      ["two-zones", ["zone-a", "zone-b"], []],
      ["spread", ["zone-a", "zone-b", "zone-c"], ["zone-spread"]],
      ["by-selector", ["zone-c"], ["single-zone"]],
    ]);
    // Without Node objects the zones cannot be named; the spread is still noted.
    const noNodes = expectOk(k8s(workload("spread", { extraSpec: spread, replicas: 3 })));
    expect(noNodes.components[0]).toMatchObject({ zones: [], tags: ["deployment", "zone-spread"] });
  });

  it("a PodDisruptionBudget whose selector matches a workload's Pods is noted on it (Labels and Selectors: matchLabels AND matchExpressions)", () => {
    const pdb = "apiVersion: policy/v1\nkind: PodDisruptionBudget\nmetadata: {name: orders-pdb, namespace: shop}\nspec:\n  minAvailable: 1\n  selector:\n    matchExpressions: [{key: app, operator: In, values: [orders, other]}]\n";
    const inv = expectOk(k8s(docs(workload("orders"), workload("web"), pdb)));
    expect(byKey(inv.components, "orders").tags).toContain("pdb:orders-pdb");
    expect(byKey(inv.components, "web").tags).not.toContain("pdb:orders-pdb");
  });
});

describe("kubernetes importer: Services", () => {
  it("a need on a Service is a need on the workloads its selector matches; several matches are an any_of group (Service)", () => {
    const body = docs(
      workload("web", { env: env({ CART_URL: "http://cart:8080" }) }),
      workload("cart-stable", { labels: { app: "cart", track: "stable" } }),
      workload("cart-canary", { labels: { app: "cart", track: "canary" } }),
      service("cart", { selector: { app: "cart" } }),
    );
    const web = byKey(expectOk(k8s(body)).components, "web");
    expect(web.needs).toEqual([expect.objectContaining({ type: "any_of", keys: ["cart-canary", "cart-stable"], strength: "hard", via: "CART_URL", provenance: ["inferred"] })]);
  });

  it("a selector that matches nothing leaves the Service's key undeclared, with a warning", () => {
    const inv = expectOk(k8s(docs(workload("web", { env: env({ SEARCH: "search:9200" }) }), service("search", { selector: { app: "elastic" } }))));
    expect(targets(byKey(inv.components, "web"))).toEqual(["search"]);
    expect(inv.components.map((c) => c.key)).toEqual(["web"]);
    expect(inv.warnings).toEqual([located("documents[1]", 22, 1, /Service shop\/search selects no workload of this push/)]);
  });

  it("ExternalName and selector-less Services are external components, with a warning each", () => {
    const ext = "apiVersion: v1\nkind: Service\nmetadata: {name: payments-api, namespace: shop}\nspec:\n  type: ExternalName\n  externalName: api.tidewater-pay.example\n";
    const body = docs(workload("web", { env: env({ PAY: "https://payments-api/v1", DB: "postgres://app@orders-db.shop:5432/orders" }) }), ext, service("orders-db", { selector: null }));
    const inv = expectOk(k8s(body));
    expect(inv.components.map((c) => [c.key, c.kind, c.tags])).toEqual([
      ["web", "service", ["deployment"]],
      ["payments-api", "external", ["externalname"]],
      ["orders-db", "external", ["selectorless-service"]],
    ]);
    expect(targets(byKey(inv.components, "web"))).toEqual(["payments-api", "orders-db"]);
    expect(byKey(inv.components, "payments-api").aliases).toEqual(["api.tidewater-pay.example"]);
    expect(inv.warnings.map((w) => w.message)).toEqual([
      expect.stringMatching(/shop\/payments-api is an ExternalName Service .*api\.tidewater-pay\.example.*kept as an external component/),
      expect.stringMatching(/shop\/orders-db is a Service without a selector/),
    ]);
  });
});

describe("kubernetes importer: cluster DNS names (DNS for Services and Pods; DNS-based service discovery specification)", () => {
  const base = [workload("orders", { ns: "shop" }), service("orders", { ns: "shop" }), workload("ledger", { ns: "pay" }), service("ledger", { ns: "pay" })];
  const needOf = (value: string, domain?: string) => {
    const inv = expectOk(k8s(docs(workload("web", { ns: "shop", env: env({ TARGET: value }) }), ...base), domain ? { clusterDomain: domain } : undefined));
    return targets(byKey(inv.components, "web"));
  };

  it.each([
    ["orders", ["orders"]],
    ["orders.shop", ["orders"]],
    ["orders.shop.svc", ["orders"]],
    ["orders.shop.svc.cluster.local", ["orders"]],
    ["orders.shop.svc.cluster.local.", ["orders"]],
    ["orders:8080", ["orders"]],
    ["http://orders.shop:8080/api/v1?x=1", ["orders"]],
    ["postgres://app:pw@orders.shop.svc.cluster.local:5432/db", ["orders"]],
    ["ledger.pay", ["ledger"]],
    ["grpc://ledger.pay.svc:9000", ["ledger"]],
  ])("%s", (value, expected) => {
    expect(needOf(value)).toEqual(expected);
  });

  it("a bare name is limited to the Pod's own namespace: `ledger` from shop names nothing", () => {
    expect(needOf("ledger")).toEqual([]);
  });

  it("the cluster domain is configurable", () => {
    expect(needOf("orders.shop.svc.corp.internal", "corp.internal")).toEqual(["orders"]);
    expect(needOf("orders.shop.svc.cluster.local", "corp.internal")).toEqual([]);
  });

  it("a Pod behind a headless Service (<hostname>.<svc>.<ns>.svc.<domain>) names that Service's workload", () => {
    const body = docs(
      workload("web", { env: env({ BROKERS: "kafka-0.kafka-headless.data.svc.cluster.local:9092,kafka-1.kafka-headless.data:9092" }) }),
      workload("kafka", { ns: "data", kind: "StatefulSet" }),
      service("kafka-headless", { ns: "data", selector: { app: "kafka" }, extra: "  clusterIP: None\n" }),
    );
    expect(targets(byKey(expectOk(k8s(body)).components, "web"))).toEqual(["kafka"]);
  });

  it("a cluster name of a Service that is not in the push is a warning, not a need", () => {
    const inv = expectOk(k8s(docs(workload("web", { env: env({ X: "http://billing.finance.svc.cluster.local/" }) }))));
    expect(inv.components[0]?.needs).toEqual([]);
    expect(inv.warnings.map((w) => w.message)).toEqual([expect.stringMatching(/shop\/web: env X names billing\.finance\.svc\.cluster\.local, Service finance\/billing, which is not in this push/)]);
  });
});

describe("kubernetes importer: needs from configuration (inferred)", () => {
  const others = [workload("orders"), service("orders"), workload("cache"), service("cache"), workload("db"), service("db")];

  it("env values give inferred hard needs with the variable in via and the entry's position", () => {
    const body = docs(workload("web", { env: env({ ORDERS_URL: "http://orders:8080", LOG_LEVEL: "info" }) }), ...others);
    const web = byKey(expectOk(k8s(body)).components, "web");
    expect(web.needs).toEqual([
      { type: "single", key: "orders", strength: "hard", via: "ORDERS_URL", provenance: ["inferred"], at: { line: 19, column: 15 }, reason: "env ORDERS_URL names Service shop/orders" },
    ]);
  });

  it("$(VAR) references are expanded from earlier entries (Define Dependent Environment Variables)", () => {
    const body = docs(workload("web", { env: env({ HOST: "cache", URL: "redis://$(HOST):6379/0" }), args: ["--cache=$(URL)"] }), ...others);
    expect(byKey(expectOk(k8s(body)).components, "web").needs.map((n) => n.via)).toEqual(["HOST"]);
  });

  it("ConfigMap values: envFrom (via = prefix + key, position at the key) and configMapKeyRef", () => {
    const cm = "apiVersion: v1\nkind: ConfigMap\nmetadata: {name: web-config, namespace: shop}\ndata:\n  ORDERS_ADDR: orders.shop.svc:8080\n  THEME: dark\n  CACHE: redis://cache\n";
    const web = workload("web", {
      env: "            - name: DB\n              valueFrom:\n                configMapKeyRef: {name: web-config, key: CACHE}\n",
    }).replace("          env:\n", "          envFrom:\n            - prefix: CFG_\n              configMapRef: {name: web-config}\n          env:\n");
    const inv = expectOk(k8s(docs(cm, web, ...others), undefined, true));
    expect(byKey(inv.components, "web").needs).toEqual([
      expect.objectContaining({ key: "orders", via: "CFG_ORDERS_ADDR", at: { line: 5, column: 3 }, reason: "envFrom ConfigMap shop/web-config key ORDERS_ADDR names Service shop/orders" }),
      expect.objectContaining({ key: "cache", via: "CFG_CACHE", reason: "envFrom ConfigMap shop/web-config key CACHE names Service shop/cache" }),
    ]);
  });

  it("Secrets: only key names are looked at; secretKeyRef and the values give nothing", () => {
    const secret = "apiVersion: v1\nkind: Secret\nmetadata: {name: creds, namespace: shop}\nstringData:\n  db: orders\n  PASSWORD: cache\ndata:\n  API_URL: aHR0cDovL2RiOjgwCg==\n";
    const web = workload("web", { env: "            - name: PW\n              valueFrom:\n                secretKeyRef: {name: creds, key: PASSWORD}\n" }).replace(
      "          env:\n",
      "          envFrom:\n            - secretRef: {name: creds}\n          env:\n",
    );
    const inv = expectOk(k8s(docs(secret, web, ...others)));
    // The key `db` is the Service db; the values "orders" and "cache" and the base64 "http://db:80" are never read.
    expect(byKey(inv.components, "web").needs).toEqual([expect.objectContaining({ key: "db", via: "db", reason: expect.stringMatching(/the key name db \(values are never read\)/) })]);
  });

  it("command and args, shell scripts included", () => {
    const body = docs(workload("web", { command: ["sh", "-c", "exec app --orders-endpoint=orders.shop:8080"], args: ["--cache-host", "cache.shop.svc.cluster.local"] }), ...others);
    expect(byKey(expectOk(k8s(body)).components, "web").needs.map((n) => [n.type === "single" && n.key, n.via, n.reason])).toEqual([
      ["orders", "command", "command[2] names Service shop/orders"],
      ["cache", "args", "args[1] names Service shop/cache"],
    ]);
  });

  it("kubelet's <SVC>_SERVICE_HOST variables name the Service (Service, Environment variables: upper-cased, - → _)", () => {
    const body = docs(workload("web", { args: ["--db=$(DB_SERVICE_HOST):$(DB_SERVICE_PORT)"] }), ...others);
    expect(targets(byKey(expectOk(k8s(body)).components, "web"))).toEqual(["db"]);
  });

  it("a workload naming its own Service (a peer list) has no need on itself", () => {
    expect(byKey(expectOk(k8s(docs(workload("orders", { args: ["--peers=orders:7000"] }), service("orders")))).components, "orders").needs).toEqual([]);
  });

  it("init containers waiting on a Service give start-up-only needs; sidecars (restartPolicy: Always) and main containers hard ones (Init Containers)", () => {
    const init = `      initContainers:
        - name: wait-db
          image: busybox
          command: ["sh", "-c", "until nc -z db 5432; do sleep 2; done"]
        - name: wait-orders
          image: busybox
          command: ["sh", "-c", "until wget -q http://orders/healthz; do sleep 2; done"]
        - name: proxy
          image: envoy
          restartPolicy: Always
          args: ["--upstream-host=cache"]
`;
    const body = docs(workload("web", { init, env: env({ ORDERS: "orders:80" }) }), ...others);
    const web = byKey(expectOk(k8s(body)).components, "web");
    expect(web.needs.map((n) => [n.type === "single" && n.key, n.strength])).toEqual([
      ["db", "startup"],
      ["orders", "hard"],
      ["cache", "hard"],
    ]);
    expect(web.needs[0]?.reason).toBe("init container wait-db: command[2] names Service shop/db (an init container: needed to start only)");
  });

  it("the Init Containers page's myapp-pod (written from memory): both init containers wait for a Service, start-up only", () => {
    // Written out from memory of the "Init Containers" concept page's example, not fetched.
    const pod = `apiVersion: v1
kind: Pod
metadata:
  name: myapp-pod
  labels:
    app.kubernetes.io/name: MyApp
spec:
  containers:
  - name: myapp-container
    image: busybox:1.28
    command: ['sh', '-c', 'echo The app is running! && sleep 3600']
  initContainers:
  - name: init-myservice
    image: busybox:1.28
    command: ['sh', '-c', "until nslookup myservice.$(cat /var/run/secrets/kubernetes.io/serviceaccount/namespace).svc.cluster.local; do echo waiting for myservice; sleep 2; done"]
  - name: init-mydb
    image: busybox:1.28
    command: ['sh', '-c', "until nslookup mydb.$(cat /var/run/secrets/kubernetes.io/serviceaccount/namespace).svc.cluster.local; do echo waiting for mydb; sleep 2; done"]
`;
    const svc = (name: string, port: number) => `apiVersion: v1\nkind: Service\nmetadata:\n  name: ${name}\nspec:\n  ports:\n  - protocol: TCP\n    port: 80\n    targetPort: ${port}\n`;
    const inv = expectOk(k8s(docs(pod, svc("myservice", 9376), svc("mydb", 9377))));
    expect(byKey(inv.components, "myapp-pod").needs.map((n) => [n.type === "single" && n.key, n.strength])).toEqual([
      ["myservice", "startup"],
      ["mydb", "startup"],
    ]);
    // The page's Services have no selector: they are external components here.
    expect(inv.components.filter((c) => c.kind === "external").map((c) => c.key)).toEqual(["myservice", "mydb"]);
  });

  it("NetworkPolicy egress rules allow paths; they are never needs", () => {
    const np = `apiVersion: networking.k8s.io/v1
kind: NetworkPolicy
metadata: {name: web-egress, namespace: shop}
spec:
  podSelector: {matchLabels: {app: web}}
  policyTypes: [Egress]
  egress:
    - to: [{podSelector: {matchLabels: {app: orders}}}]
`;
    const inv = expectOk(k8s(docs(workload("web"), np, ...others)));
    expect(byKey(inv.components, "web").needs).toEqual([]);
  });
});

describe("kubernetes importer: entries (Ingress, Gateway API)", () => {
  it("an Ingress is a gateway that needs each backend Service's workloads, hard (Ingress: rules, paths, defaultBackend)", () => {
    const ingress = `apiVersion: networking.k8s.io/v1
kind: Ingress
metadata: {name: storefront, namespace: shop}
spec:
  defaultBackend:
    service: {name: web, port: {number: 80}}
  rules:
    - host: shop.example
      http:
        paths:
          - {path: /api, pathType: Prefix, backend: {service: {name: api, port: {number: 80}}}}
          - {path: /, pathType: Prefix, backend: {service: {name: web, port: {number: 80}}}}
          - {path: /gone, pathType: Prefix, backend: {service: {name: retired, port: {number: 80}}}}
`;
    const inv = expectOk(k8s(docs(workload("web"), service("web"), workload("api"), service("api"), ingress)));
    const entry = byKey(inv.components, "storefront");
    expect(entry).toMatchObject({ kind: "gateway", tags: ["ingress"] });
    expect(entry.needs).toEqual([
      { type: "single", key: "web", strength: "hard", via: null },
      { type: "single", key: "api", strength: "hard", via: null },
    ]);
    expect(inv.warnings.map((w) => w.message)).toEqual([expect.stringMatching(/Ingress shop\/storefront routes shop.example\/gone to Service shop\/retired, which is not in this push/)]);
  });

  it("HTTPRoute and GRPCRoute backends become needs of their parent Gateway (Gateway API HTTPRoute: namespaces default to the route's)", () => {
    const gw = "apiVersion: gateway.networking.k8s.io/v1\nkind: Gateway\nmetadata: {name: edge, namespace: infra}\nspec:\n  gatewayClassName: example\n  listeners: [{name: http, port: 80, protocol: HTTP}]\n";
    const http = `apiVersion: gateway.networking.k8s.io/v1
kind: HTTPRoute
metadata: {name: shop-routes, namespace: shop}
spec:
  parentRefs: [{name: edge, namespace: infra}]
  rules:
    - backendRefs: [{name: web, port: 80, weight: 90}, {name: web-next, port: 80, weight: 10}]
    - backendRefs: [{name: ledger, namespace: pay, port: 80}]
`;
    const grpc = "apiVersion: gateway.networking.k8s.io/v1\nkind: GRPCRoute\nmetadata: {name: rpc, namespace: shop}\nspec:\n  parentRefs: [{name: edge, namespace: infra}]\n  rules:\n    - backendRefs: [{name: api, port: 9000}]\n";
    const body = docs(gw, http, grpc, workload("web"), service("web"), workload("web-next"), service("web-next"), workload("api"), service("api"), workload("ledger", { ns: "pay" }), service("ledger", { ns: "pay" }));
    const inv = expectOk(k8s(body));
    expect(targets(byKey(inv.components, "edge"))).toEqual(["web", "web-next", "ledger", "api"]);
    expect(byKey(inv.components, "edge")).toMatchObject({ kind: "gateway", name: "infra/edge" });
    expect(inv.warnings).toEqual([]);
  });

  it("a route whose Gateway is not in the push is kept as the entry itself, with a warning", () => {
    const http = "apiVersion: gateway.networking.k8s.io/v1\nkind: HTTPRoute\nmetadata: {name: shop-routes, namespace: shop}\nspec:\n  parentRefs: [{name: edge, namespace: infra}]\n  rules:\n    - backendRefs: [{name: web, port: 80}]\n";
    const inv = expectOk(k8s(docs(http, workload("web"), service("web"))));
    expect(byKey(inv.components, "shop-routes")).toMatchObject({ kind: "gateway", tags: ["httproute"], needs: [expect.objectContaining({ key: "web" })] });
    expect(inv.warnings.map((w) => w.message)).toEqual([expect.stringMatching(/HTTPRoute shop\/shop-routes attaches to no Gateway of this push \(infra\/edge\)/)]);
  });
});

describe("kubernetes importer: owners, annotations and aliases", () => {
  const ns = (name: string, extra: string) => `apiVersion: v1\nkind: Namespace\nmetadata:\n  name: ${name}\n${extra}`;

  it("the team comes from the object's team label, then the push's namespace mapping, then the Namespace's annotation, then (if asked) the namespace's name", () => {
    const body = docs(
      workload("labelled", { meta: "  labels: {team: checkout}\n" }),
      workload("by-namespace-object", { ns: "pay" }),
      workload("by-mapping", { ns: "shop" }),
      workload("by-name", { ns: "search" }),
      ns("pay", "  annotations: {pinchpoint/team: payments}\n"),
    );
    const teams = (o?: KubernetesImportOptions) => expectOk(k8s(body, o)).components.map((c) => [c.key, c.team]);
    expect(teams()).toEqual([["labelled", "checkout"], ["by-namespace-object", "payments"], ["by-mapping", null], ["by-name", null]]);
    expect(teams({ teams: { shop: "storefront", pay: "billing" }, namespaceTeams: true })).toEqual([
      ["labelled", "checkout"],
      ["by-namespace-object", "billing"],
      ["by-mapping", "storefront"],
      ["by-name", "search"],
    ]);
  });

  it("the team key is configurable (label or annotation); a value that is not a team slug is a warning and leaves it unowned", () => {
    const body = docs(
      workload("a", { meta: "  annotations: {example.org/owner: fulfilment}\n" }),
      workload("b", { labels: { app: "b", "example.org/owner": "Team B!" } }),
    );
    const inv = expectOk(k8s(body, { teamKey: "example.org/owner" }));
    expect(inv.components.map((c) => c.team)).toEqual(["fulfilment", null]);
    expect(inv.warnings.map((w) => w.message)).toEqual([
      expect.stringMatching(/team "Team B!" \(from shop\/b\) is not a team slug/),
      expect.stringMatching(/the 2 components have no needs\. Names built into images cannot be seen; declare them with the pinchpoint\/needs annotation/),
    ]);
  });

  it("pinchpoint/tier, pinchpoint/kind and pinchpoint/needs annotations", () => {
    const meta = '  annotations:\n    pinchpoint/tier: "1"\n    pinchpoint/kind: datastore\n    pinchpoint/needs: "cache, ledger-db.finance=soft, Not_A_Key!"\n';
    const inv = expectOk(k8s(docs(workload("orders", { meta }), workload("cache"), service("cache"))));
    const orders = byKey(inv.components, "orders");
    expect(orders).toMatchObject({ tier: 1, kind: "datastore" });
    expect(orders.needs).toEqual([
      { type: "single", key: "cache", strength: "hard", via: null },
      { type: "single", key: "ledger-db.finance", strength: "soft", via: null },
    ]);
    expect(inv.warnings.map((w) => w.message)).toEqual([expect.stringMatching(/pinchpoint\/needs entry "Not_A_Key!" is not a Service or component key/)]);
  });

  it("aliases: Services that select only this workload and its app labels, when no other name claims them; off with aliases=false", () => {
    const body = docs(
      workload("cart-v2", { labels: { app: "cart", "app.kubernetes.io/name": "cartservice" } }),
      service("cart", { selector: { app: "cart" } }),
      workload("redis-leader", { labels: { app: "redis", role: "leader" } }),
      workload("redis-follower", { labels: { app: "redis", role: "follower" } }),
    );
    const inv = expectOk(k8s(body));
    expect(inv.components.map((c) => [c.key, c.aliases])).toEqual([
      ["cart-v2", ["cart", "cartservice"]],
      // `redis` is claimed by both: neither gets it.
      ["redis-leader", []],
      ["redis-follower", []],
    ]);
    expect(expectOk(k8s(body, { aliases: false })).components.every((c) => c.aliases.length === 0)).toBe(true);
  });
});

describe("kubernetes importer: Secrets' values", () => {
  it("are dropped while parsing: nothing returned holds them, the last-applied copy included", () => {
    const marker = "MARKER-5f3a9c-do-not-store";
    const b64 = Buffer.from(marker).toString("base64");
    const secret = `apiVersion: v1
kind: Secret
metadata:
  name: db-creds
  namespace: shop
  annotations:
    kubectl.kubernetes.io/last-applied-configuration: '{"apiVersion":"v1","kind":"Secret","stringData":{"password":"${marker}"}}'
stringData:
  password: ${marker}
data:
  token: ${b64}
`;
    const web = workload("web", { env: "            - name: PW\n              valueFrom:\n                secretKeyRef: {name: db-creds, key: password}\n" });
    const result = k8s(docs(secret, web), undefined, true);
    const text = JSON.stringify(result);
    expect(text).not.toContain(marker);
    expect(text).not.toContain(b64);
    expectOk(result);
    // A broken manifest's issues do not quote the value either.
    const broken = JSON.stringify(k8s(secret.replace(`password: ${marker}`, `password: ${marker}\n  password: ${marker}`)));
    expect(broken).not.toContain(marker);
  });
});

describe("kubernetes importer: positions", () => {
  it("fills `at` on components and declared needs when asked, and on inferred needs always", () => {
    const body = docs(workload("web", { env: env({ ORDERS: "orders" }) }), workload("orders"), service("orders"));
    const plain = expectOk(k8s(body));
    expect(byKey(plain.components, "web").at).toBeUndefined();
    expect(byKey(plain.components, "web").needs[0]?.at).toEqual({ line: 19, column: 15 });
    const withPositions = expectOk(k8s(body, undefined, true));
    expect(byKey(withPositions.components, "orders").at).toEqual({ line: 22, column: 1 });
  });
});
