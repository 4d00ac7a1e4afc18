// The parts of the Kubernetes API this importer reads, as published in the API reference
// (core/v1, apps/v1, batch/v1, autoscaling/v2, policy/v1, networking.k8s.io/v1,
// gateway.networking.k8s.io/v1). Loose objects: a manifest carries far more than we read, and
// it is someone else's format, so fields we do not know are not errors. Types follow the
// reference (labels and env values are strings, replicas whole numbers); an object the API
// server would refuse for those fields is refused here too, with its position.
import { z } from "zod";

const Name = z.string({ error: "a name must be a string" }).min(1, { error: "empty name" });
const StringMap = (what: string) => z.record(z.string(), z.string({ error: `${what} values must be strings (quote numbers and booleans)` }));

const ObjectMetaSchema = z.looseObject({
  name: Name,
  namespace: Name.optional(),
  labels: StringMap("label").nullable().optional(),
  annotations: StringMap("annotation").nullable().optional(),
  ownerReferences: z.array(z.looseObject({ kind: z.string(), name: z.string() })).nullable().optional(),
});

/** metav1.LabelSelector: matchLabels AND every matchExpressions requirement. */
const LabelSelectorSchema = z.looseObject({
  matchLabels: StringMap("matchLabels").nullable().optional(),
  matchExpressions: z
    .array(
      z.looseObject({
        key: z.string(),
        operator: z.enum(["In", "NotIn", "Exists", "DoesNotExist"], { error: (iss) => `invalid operator ${JSON.stringify(iss.input)}: expected In, NotIn, Exists or DoesNotExist` }),
        values: z.array(z.string()).nullable().optional(),
      }),
    )
    .nullable()
    .optional(),
});
export type LabelSelector = z.infer<typeof LabelSelectorSchema>;

const KeyRef = z.looseObject({ name: z.string().optional(), key: z.string() });

const EnvVarSchema = z.looseObject({
  name: z.string({ error: "an env entry needs a name" }),
  value: z.string({ error: "env values must be strings (quote numbers and booleans)" }).nullable().optional(),
  valueFrom: z.looseObject({ configMapKeyRef: KeyRef.nullable().optional(), secretKeyRef: KeyRef.nullable().optional() }).nullable().optional(),
});

const NameRef = z.looseObject({ name: z.string().optional() });

const ContainerSchema = z.looseObject({
  name: z.string().optional(),
  command: z.array(z.string({ error: "command entries must be strings" })).nullable().optional(),
  args: z.array(z.string({ error: "args entries must be strings" })).nullable().optional(),
  env: z.array(EnvVarSchema).nullable().optional(),
  envFrom: z.array(z.looseObject({ prefix: z.string().optional(), configMapRef: NameRef.nullable().optional(), secretRef: NameRef.nullable().optional() })).nullable().optional(),
  /** `Always` on an init container makes it a sidecar that runs for the Pod's whole life. */
  restartPolicy: z.string().optional(),
});
export type Container = z.infer<typeof ContainerSchema>;

const NodeSelectorTerm = z.looseObject({
  matchExpressions: z.array(z.looseObject({ key: z.string(), operator: z.string(), values: z.array(z.string()).nullable().optional() })).nullable().optional(),
});

const PodSpecSchema = z.looseObject({
  containers: z.array(ContainerSchema, { error: "containers must be a list" }).nullable().optional(),
  initContainers: z.array(ContainerSchema).nullable().optional(),
  nodeSelector: StringMap("nodeSelector").nullable().optional(),
  affinity: z
    .looseObject({
      nodeAffinity: z
        .looseObject({ requiredDuringSchedulingIgnoredDuringExecution: z.looseObject({ nodeSelectorTerms: z.array(NodeSelectorTerm).nullable().optional() }).nullable().optional() })
        .nullable()
        .optional(),
      podAntiAffinity: z
        .looseObject({ requiredDuringSchedulingIgnoredDuringExecution: z.array(z.looseObject({ topologyKey: z.string().optional() })).nullable().optional() })
        .nullable()
        .optional(),
    })
    .nullable()
    .optional(),
  topologySpreadConstraints: z.array(z.looseObject({ topologyKey: z.string(), whenUnsatisfiable: z.string().optional() })).nullable().optional(),
  hostname: z.string().optional(),
  subdomain: z.string().optional(),
});
export type PodSpec = z.infer<typeof PodSpecSchema>;

const PodTemplateSchema = z.looseObject({
  metadata: z.looseObject({ labels: StringMap("label").nullable().optional(), annotations: StringMap("annotation").nullable().optional() }).nullable().optional(),
  spec: PodSpecSchema,
});

const Replicas = z.int({ error: (iss) => `invalid replicas ${JSON.stringify(iss.input)}: expected a whole number` }).min(0, { error: "replicas must not be negative" });

const object = <S extends z.core.$ZodLooseShape>(spec: S) => z.looseObject({ apiVersion: z.string(), kind: z.string(), metadata: ObjectMetaSchema, ...spec });

const DeploymentSchema = object({
  spec: z.looseObject({ replicas: Replicas.nullable().optional(), selector: LabelSelectorSchema.nullable().optional(), template: PodTemplateSchema, serviceName: z.string().optional() }),
});
const DaemonSetSchema = object({
  spec: z.looseObject({ selector: LabelSelectorSchema.nullable().optional(), template: PodTemplateSchema }),
  status: z.looseObject({ desiredNumberScheduled: z.int().optional() }).nullable().optional(),
});
const JobSchema = object({ spec: z.looseObject({ parallelism: Replicas.nullable().optional(), template: PodTemplateSchema }) });
const CronJobSchema = object({
  spec: z.looseObject({ schedule: z.string().optional(), jobTemplate: z.looseObject({ spec: z.looseObject({ parallelism: Replicas.nullable().optional(), template: PodTemplateSchema }) }) }),
});
const PodSchema = object({ spec: PodSpecSchema });

const ServiceSchema = object({
  spec: z
    .looseObject({
      type: z.string().optional(),
      selector: StringMap("selector").nullable().optional(),
      externalName: z.string().optional(),
      clusterIP: z.string().optional(),
    })
    .nullable()
    .optional(),
});

/** networking.k8s.io/v1 `service: {name}`; the older extensions/v1beta1 `serviceName` is read too. */
const IngressBackend = z.looseObject({ service: z.looseObject({ name: z.string() }).nullable().optional(), serviceName: z.string().optional() });
const IngressSchema = object({
  spec: z
    .looseObject({
      defaultBackend: IngressBackend.nullable().optional(),
      backend: IngressBackend.nullable().optional(),
      rules: z
        .array(
          z.looseObject({
            host: z.string().optional(),
            http: z.looseObject({ paths: z.array(z.looseObject({ path: z.string().optional(), backend: IngressBackend })) }).nullable().optional(),
          }),
        )
        .nullable()
        .optional(),
    })
    .nullable()
    .optional(),
});

const ParentRef = z.looseObject({ group: z.string().optional(), kind: z.string().optional(), namespace: z.string().optional(), name: z.string() });
const BackendRef = z.looseObject({ group: z.string().optional(), kind: z.string().optional(), namespace: z.string().optional(), name: z.string(), weight: z.int().optional() });
const GatewaySchema = object({ spec: z.looseObject({ gatewayClassName: z.string().optional() }).nullable().optional() });
const RouteSchema = object({
  spec: z.looseObject({
    parentRefs: z.array(ParentRef).nullable().optional(),
    rules: z.array(z.looseObject({ backendRefs: z.array(BackendRef).nullable().optional() })).nullable().optional(),
  }),
});

const HpaSchema = object({
  spec: z.looseObject({
    scaleTargetRef: z.looseObject({ kind: z.string(), name: z.string() }),
    minReplicas: z.int({ error: "minReplicas must be a whole number" }).min(1, { error: "minReplicas must be at least 1" }).nullable().optional(),
  }),
});
const PdbSchema = object({ spec: z.looseObject({ selector: LabelSelectorSchema.nullable().optional() }).nullable().optional() });
const ConfigMapSchema = object({ data: z.record(z.string(), z.string({ error: "ConfigMap data values must be strings" })).nullable().optional() });
/** Values were dropped while parsing (load.ts); only the object's name matters here. */
const SecretSchema = object({});
const NamespaceSchema = object({});
const NodeSchema = object({});
const NetworkPolicySchema = object({ spec: z.looseObject({ podSelector: LabelSelectorSchema.nullable().optional() }).nullable().optional() });

/**
 * Kinds read, by API group (the part of apiVersion before `/`; "" for core/v1). A kind under
 * another group (an Istio `Gateway`, say) is a different API and counts as unknown.
 */
export const KINDS = {
  Deployment: { groups: ["apps", "extensions"], schema: DeploymentSchema },
  StatefulSet: { groups: ["apps"], schema: DeploymentSchema },
  DaemonSet: { groups: ["apps", "extensions"], schema: DaemonSetSchema },
  ReplicaSet: { groups: ["apps", "extensions"], schema: DeploymentSchema },
  Job: { groups: ["batch"], schema: JobSchema },
  CronJob: { groups: ["batch"], schema: CronJobSchema },
  Pod: { groups: [""], schema: PodSchema },
  Service: { groups: [""], schema: ServiceSchema },
  Ingress: { groups: ["networking.k8s.io", "extensions"], schema: IngressSchema },
  Gateway: { groups: ["gateway.networking.k8s.io"], schema: GatewaySchema },
  HTTPRoute: { groups: ["gateway.networking.k8s.io"], schema: RouteSchema },
  GRPCRoute: { groups: ["gateway.networking.k8s.io"], schema: RouteSchema },
  HorizontalPodAutoscaler: { groups: ["autoscaling"], schema: HpaSchema },
  PodDisruptionBudget: { groups: ["policy"], schema: PdbSchema },
  ConfigMap: { groups: [""], schema: ConfigMapSchema },
  Secret: { groups: [""], schema: SecretSchema },
  Namespace: { groups: [""], schema: NamespaceSchema },
  Node: { groups: [""], schema: NodeSchema },
  NetworkPolicy: { groups: ["networking.k8s.io"], schema: NetworkPolicySchema },
} as const;
export type ReadKind = keyof typeof KINDS;

export const WORKLOAD_KINDS = ["Deployment", "StatefulSet", "DaemonSet", "ReplicaSet", "CronJob", "Job", "Pod"] as const;
export type WorkloadKind = (typeof WORKLOAD_KINDS)[number];

export type Deployment = z.infer<typeof DeploymentSchema>;
export type DaemonSet = z.infer<typeof DaemonSetSchema>;
export type Job = z.infer<typeof JobSchema>;
export type CronJob = z.infer<typeof CronJobSchema>;
export type Pod = z.infer<typeof PodSchema>;
export type Service = z.infer<typeof ServiceSchema>;
export type Ingress = z.infer<typeof IngressSchema>;
export type Route = z.infer<typeof RouteSchema>;
export type Hpa = z.infer<typeof HpaSchema>;
export type Pdb = z.infer<typeof PdbSchema>;
export type ConfigMap = z.infer<typeof ConfigMapSchema>;
export type ObjectMeta = z.infer<typeof ObjectMetaSchema>;

/**
 * JSON Schema of a `format=kubernetes` body, for the OpenAPI document: one object, a `*List` of
 * objects or an array of them (multi-document YAML is the same objects separated by `---`).
 * Only the envelope is described; each kind read is checked against its schema above.
 */
export function kubernetesJsonSchema(): Record<string, unknown> {
  const object = {
    type: "object",
    required: ["apiVersion", "kind", "metadata"],
    properties: {
      apiVersion: { type: "string" },
      kind: { type: "string", description: `Read: ${Object.keys(KINDS).join(", ")}; other kinds are skipped and counted in one warning` },
      metadata: z.toJSONSchema(ObjectMetaSchema, { io: "input", unrepresentable: "any" }),
    },
    additionalProperties: true,
  };
  return {
    title: "Kubernetes manifests (format=kubernetes)",
    description: "Multi-document YAML, JSON, or a List as `kubectl get -o yaml|json` writes it. Secrets' values are dropped while parsing and never stored.",
    anyOf: [
      object,
      { type: "object", required: ["kind", "items"], properties: { kind: { type: "string", pattern: "List$" }, items: { type: "array", items: object } } },
      { type: "array", items: object },
    ],
  };
}
