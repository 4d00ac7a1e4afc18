// Spans as the trace fold reads them: only what names the two ends of a call and measures it.
// Decoders (importers/otlp) turn OTLP/JSON and OTLP protobuf into these; nothing else is kept.

/** opentelemetry-proto trace.proto, Span.SpanKind. */
export const SPAN_KIND = { unspecified: 0, internal: 1, server: 2, client: 3, producer: 4, consumer: 5 } as const;

/** opentelemetry-proto trace.proto, Status.StatusCode. */
export const STATUS_CODE_ERROR = 2;

/** The span attributes that can name the callee of a call or the protocol it used. */
export interface CalleeAttributes {
  peerService?: string;
  serverAddress?: string;
  netPeerName?: string;
  urlFull?: string;
  rpcService?: string;
  rpcSystem?: string;
  dbSystem?: string;
  dbNamespace?: string;
  messagingSystem?: string;
  messagingDestination?: string;
  /** messaging.destination.temporary or .anonymous: the name is made up per conversation */
  messagingDestinationTemporary?: boolean;
  httpMethod?: string;
}

/** The attribute keys read into CalleeAttributes, newest name first where one was renamed. */
export const ATTRIBUTE_KEYS: Record<string, keyof CalleeAttributes> = {
  "peer.service": "peerService",
  "server.address": "serverAddress",
  "net.peer.name": "netPeerName",
  "url.full": "urlFull",
  "http.url": "urlFull",
  "rpc.service": "rpcService",
  "rpc.system": "rpcSystem",
  "rpc.system.name": "rpcSystem",
  "db.system.name": "dbSystem",
  "db.system": "dbSystem",
  "db.namespace": "dbNamespace",
  "db.name": "dbNamespace",
  "messaging.system": "messagingSystem",
  "messaging.destination.name": "messagingDestination",
  "messaging.destination": "messagingDestination",
  "messaging.destination.temporary": "messagingDestinationTemporary",
  "messaging.destination.anonymous": "messagingDestinationTemporary",
  "http.request.method": "httpMethod",
  "http.method": "httpMethod",
};

/** Where a renamed attribute has both names on one span, the current one wins. */
export const DEPRECATED_KEYS = new Set(["http.url", "db.system", "db.name", "messaging.destination", "http.method", "rpc.system"]);

export interface TraceSpan {
  /** Hex ids lower-cased (OTLP/JSON ids are case-insensitive hex); any other spelling kept as sent. */
  traceId: string;
  spanId: string;
  /** Read for SERVER spans only: the fold pairs a SERVER span with its CLIENT parent, and nothing else needs it. */
  parentSpanId: string | null;
  kind: number;
  /** The resource's service.name, as sent. */
  service: string;
  durationNs: number;
  error: boolean;
  attrs: CalleeAttributes;
}

/** Spans a decoder could not use, counted by reason (sent back as an OTLP partial success). */
export interface RejectedSpans {
  count: number;
  reasons: Map<string, number>;
}

export const noRejects = (): RejectedSpans => ({ count: 0, reasons: new Map() });

export function reject(r: RejectedSpans, reason: string, n = 1): void {
  r.count += n;
  r.reasons.set(reason, (r.reasons.get(reason) ?? 0) + n);
}

/** "12 spans …; 3 spans …": one English sentence per reason, as the partial success error_message SHOULD be. */
export function describeRejects(r: RejectedSpans): string {
  return [...r.reasons].map(([reason, n]) => `${n} span${n === 1 ? "" : "s"} ${reason}`).join("; ");
}
