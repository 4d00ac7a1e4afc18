// The address a request came from, for the per-address sign-in limit. X-Forwarded-For is a list
// that every proxy on the way appends to, and everything a client sends is its own word: only the
// entries our own proxies appended can be trusted. `next start` does not append the connection's
// address (it fills the header in only when it is missing), so the launcher (scripts/serve.ts)
// works the address out from the socket itself and hands the app that one address.

/** Proxies in front of the app that append to X-Forwarded-For (PINCHPOINT_TRUSTED_PROXY_HOPS, default 0). */
export function trustedProxyHops(value = process.env.PINCHPOINT_TRUSTED_PROXY_HOPS): number {
  const n = Number(value ?? 0);
  return Number.isInteger(n) && n > 0 ? n : 0;
}

/**
 * With no trusted proxy, the socket's peer. Behind N trusted proxies the innermost one is the peer,
 * and the address it saw is the last X-Forwarded-For entry; the client is N entries from the right of
 * the list with the peer appended. A list shorter than that cannot have come through all N
 * proxies: its leftmost entry is taken, as the best there is.
 */
export function clientAddress({ peer, forwardedFor, hops }: { peer: string | undefined; forwardedFor: string | string[] | undefined; hops: number }): string {
  const self = normalise(peer ?? "") || "unknown";
  if (hops <= 0) return self;
  const header = Array.isArray(forwardedFor) ? forwardedFor.join(",") : (forwardedFor ?? "");
  const chain = [...header.split(",").map((a) => normalise(a)).filter(Boolean), self];
  return chain[Math.max(0, chain.length - 1 - hops)] ?? self;
}

/** `::ffff:127.0.0.1` (an IPv4 peer on a dual-stack socket) is 127.0.0.1. */
function normalise(address: string): string {
  const a = address.trim();
  return a.startsWith("::ffff:") && a.includes(".") ? a.slice(7) : a;
}
