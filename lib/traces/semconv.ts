// Who a span calls, read from the OpenTelemetry semantic conventions. The rules, in the order they
// are tried for a CLIENT span (each names the attribute's page in the semantic conventions):
//   1. the service.name of the SERVER span that is its child (same trace, parent = this span):
//      the callee said who it is (resource/service.md) — decided by the fold, not here;
//   2. peer.service — "the service.name of the remote service" (registry/attributes/peer.md);
//   3. server.address, else the deprecated net.peer.name (registry/attributes/net.md: "replaced by
//      server.address on client spans"), else the host of url.full / http.url: the server's DNS name
//      (general/attributes.md, server.address); a port written into the value is stripped;
//   4. rpc.service — "the full (logical) name of the service being called" (registry/attributes/rpc.md);
//   5. a database call (db.system.name, or the deprecated db.system; database/database-spans.md):
//      the datastore is named by its address (rule 3) when there is one, else by db.namespace, "the
//      name of the database, fully qualified within the server address" (registry/attributes/db.md),
//      prefixed with the system. Never by the product alone: every service using "postgresql" would
//      then share one made-up component and look like a single point of failure.
// Messaging (messaging/messaging-spans.md) is asynchronous: a PRODUCER (or a CLIENT "send") and a
// CONSUMER both need the destination, "uniquely identified by its name within the messaging system
// instance", so producer → destination ← consumer and never producer → consumer: a consumer being
// down does not take the producer down.
import { KEY_PATTERN } from "@/lib/inventory/types";
import type { CalleeAttributes } from "./types";

export type CalleeKind = "service" | "datastore" | "queue";

/** How a callee was named; kept with each observed edge so the drift screen can say why. */
export type Evidence =
  | "child-span"
  | "parent-span"
  | "peer.service"
  | "server.address"
  | "net.peer.name"
  | "url.full"
  | "rpc.service"
  | "db.namespace"
  | "messaging.destination";

export interface Callee {
  /** A component key (normaliseKey). */
  name: string;
  kind: CalleeKind;
  /** Protocol label for the need's `via`. */
  via: string | null;
  evidence: Evidence;
}

/**
 * A name from telemetry as a component key: lower-cased, characters outside a-z 0-9 . _ - become
 * "-", leading non-alphanumerics dropped, cut to 128 ("Checkout API" → "checkout-api").
 */
export function normaliseKey(raw: string): string | null {
  const key = raw
    .toLowerCase()
    .replace(/[^a-z0-9._-]/g, "-")
    .replace(/^[^a-z0-9]+/, "")
    .slice(0, 128);
  return KEY_PATTERN.test(key) ? key : null;
}

/** "cart:7070" → "cart", "[::1]:443" → "::1"; a bare IPv6 address is left whole. */
export function stripPort(host: string): string {
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(host);
  if (bracketed) return bracketed[1]!;
  const colons = host.split(":").length - 1;
  return colons === 1 ? host.replace(/:\d*$/, "") : host;
}

function hostOfUrl(url: string): string | null {
  try {
    const host = new URL(url).hostname;
    return host === "" ? null : host.replace(/^\[|\]$/g, "");
  } catch {
    return null;
  }
}

/** The protocol a call used, for `via`. */
export function protocolOf(a: CalleeAttributes): string | null {
  if (a.messagingSystem) return a.messagingSystem.toLowerCase();
  if (a.dbSystem) return a.dbSystem.toLowerCase();
  if (a.rpcSystem) return a.rpcSystem.toLowerCase();
  if (a.httpMethod || a.urlFull) return "http";
  return null;
}

/** The messaging destination a producer or consumer needs, or null without a usable destination name. */
export function messagingDestination(a: CalleeAttributes): Callee | null {
  if (!a.messagingSystem || !a.messagingDestination || a.messagingDestinationTemporary) return null;
  const name = normaliseKey(`${a.messagingSystem}-${a.messagingDestination}`);
  return name === null ? null : { name, kind: "queue", via: `${a.messagingSystem.toLowerCase()} (asynchronous)`, evidence: "messaging.destination" };
}

/** Rules 2–5 above: the callee the attributes of one CLIENT span name, or null. */
export function calleeFromAttributes(a: CalleeAttributes): Callee | null {
  const kind: CalleeKind = a.dbSystem ? "datastore" : "service";
  const via = protocolOf(a);
  const named = (raw: string | null | undefined, evidence: Evidence): Callee | null => {
    if (!raw) return null;
    const name = normaliseKey(raw);
    return name === null ? null : { name, kind, via, evidence };
  };
  return (
    named(a.peerService, "peer.service") ??
    named(a.serverAddress ? stripPort(a.serverAddress) : null, "server.address") ??
    named(a.netPeerName ? stripPort(a.netPeerName) : null, "net.peer.name") ??
    named(a.urlFull ? hostOfUrl(a.urlFull) : null, "url.full") ??
    named(a.rpcService, "rpc.service") ??
    (a.dbSystem && a.dbNamespace ? named(`${a.dbSystem}-${a.dbNamespace}`, "db.namespace") : null)
  );
}

/** Is this span a messaging operation (its attributes name a messaging system)? */
export const isMessaging = (a: CalleeAttributes): boolean => a.messagingSystem !== undefined;

/** Database spans have no instrumented server side to wait for. */
export const isDatabaseCall = (a: CalleeAttributes): boolean => a.dbSystem !== undefined;
