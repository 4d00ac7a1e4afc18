// A component's kind guessed from its image name: the one table of this guess. The repository
// path's last part (`bitnami/postgresql:16` → `postgresql`, `otel/opentelemetry-collector-contrib`
// → `opentelemetry-collector-contrib`) is matched against each row's names, whole or followed by
// `-something` (`cp-kafka`, `redis-stack`). Exporters and agents are looked at first, so
// `postgres-exporter` is telemetry, not a datastore. `x-pinchpoint: { kind: … }` overrides the guess.
import type { DeclaredKind } from "@/lib/inventory/types";

const IMAGE_KINDS: readonly { kind: DeclaredKind; names: readonly string[]; why: string }[] = [
  {
    kind: "telemetry",
    why: "a trace, metric or log collector or agent",
    names: [
      "opentelemetry-collector", "otel-collector", "otelcol", "jaeger", "all-in-one", "zipkin", "tempo", "prometheus",
      "pushgateway", "alertmanager", "grafana", "loki", "promtail", "alloy", "fluentd", "fluent-bit", "logstash",
      "vector", "agent", "datadog-agent", "dd-agent", "newrelic-infrastructure", "telegraf", "statsd", "node-exporter",
      "cadvisor", "victoria-metrics", "victoriametrics", "vmagent", "filebeat", "metricbeat", "apm-server", "kibana",
      "signoz", "uptrace", "otel-lgtm",
    ],
  },
  {
    kind: "datastore",
    why: "a database or object store",
    names: [
      "postgres", "postgresql", "postgis", "timescaledb", "mysql", "mariadb", "percona", "mongo", "mongodb", "cassandra",
      "scylla", "cockroach", "cockroachdb", "couchdb", "couchbase", "neo4j", "elasticsearch", "opensearch", "clickhouse",
      "clickhouse-server", "influxdb", "questdb", "arangodb", "rethinkdb", "server" /* mcr.microsoft.com/mssql/server */,
      "mssql", "sqlserver", "oracle", "db2", "minio", "etcd", "dynamodb-local", "yugabyte", "tidb", "surrealdb",
    ],
  },
  { kind: "cache", why: "an in-memory cache", names: ["redis", "memcached", "valkey", "keydb", "dragonfly", "varnish", "hazelcast"] },
  {
    kind: "queue",
    why: "a message broker or queue",
    names: ["rabbitmq", "kafka", "cp-kafka", "redpanda", "nats", "nats-streaming", "activemq", "artemis", "pulsar", "mosquitto", "emqx", "nsqd", "zookeeper", "cp-zookeeper"],
  },
  { kind: "gateway", why: "a reverse proxy or gateway", names: ["nginx", "envoy", "haproxy", "traefik", "caddy", "kong", "httpd", "openresty", "krakend", "tyk-gateway", "ingress-nginx"] },
];

/** The repository name's last path part, lower-cased, without registry, tag or digest. */
function imageName(image: string): string {
  const noDigest = image.split("@")[0] ?? image;
  const parts = noDigest.toLowerCase().split("/");
  let last = parts[parts.length - 1] ?? "";
  const colon = last.indexOf(":");
  if (colon !== -1) last = last.slice(0, colon);
  return last;
}

// `-exporter` images export a system's metrics: telemetry whatever system they watch.
const EXPORTER = /(^|-)exporter(-|$)|-agent$|^agent-/;
const TOOL = /-(ui|admin|commander|express|console|manager|web|cli|client|init|setup|migrate|migrations?|insight)$/;

export function kindFromImage(image: string): { kind: DeclaredKind; why: string; name: string } | null {
  const name = imageName(image);
  if (name === "") return null;
  if (EXPORTER.test(name)) return { kind: "telemetry", why: "a metrics exporter or agent", name };
  // Admin screens, clients and one-shot set-up images named after the system they serve are not that system.
  if (TOOL.test(name)) return null;
  // The mssql image is `mssql/server`: "server" alone only counts under an mssql path.
  const full = image.toLowerCase();
  for (const row of IMAGE_KINDS) {
    for (const n of row.names) {
      if (n === "server" && !/mssql\/server/.test(full)) continue;
      if (n === "agent" && !/datadog|newrelic|grafana|elastic/.test(full)) continue;
      if (n === "all-in-one" && !/jaeger/.test(full)) continue;
      if (name === n || name.startsWith(`${n}-`)) return { kind: row.kind, why: row.why, name };
    }
  }
  return null;
}
