// Which address the sign-in limit counts against. The rule is the one MDN's X-Forwarded-For page
// gives under "Selecting an IP address" (from memory): with N trusted proxies, count N entries from
// the right of the list plus the connection's own address; with none, only the connection counts.
import { describe, expect, it } from "vitest";
import { clientAddress, trustedProxyHops } from "@/lib/auth/client-address";

describe("clientAddress", () => {
  it("ignores a made-up X-Forwarded-For when no proxy is trusted", () => {
    for (let i = 0; i < 22; i++) {
      expect(clientAddress({ peer: "203.0.113.7", forwardedFor: `198.51.100.${i}`, hops: 0 })).toBe("203.0.113.7");
    }
  });

  it("takes the entry the one trusted proxy appended, not what the client put before it", () => {
    expect(clientAddress({ peer: "10.0.0.2", forwardedFor: "198.51.100.9, 203.0.113.7", hops: 1 })).toBe("203.0.113.7");
  });

  it("counts from the right through several trusted proxies", () => {
    expect(clientAddress({ peer: "10.0.0.3", forwardedFor: "1.1.1.1, 203.0.113.7, 10.0.0.2", hops: 2 })).toBe("203.0.113.7");
  });

  it("falls back to the leftmost entry when the list is shorter than the trusted hops", () => {
    expect(clientAddress({ peer: "10.0.0.2", forwardedFor: undefined, hops: 3 })).toBe("10.0.0.2");
    expect(clientAddress({ peer: "10.0.0.2", forwardedFor: "203.0.113.7", hops: 3 })).toBe("203.0.113.7");
  });

  it("reads an IPv4 peer on a dual-stack socket as IPv4", () => {
    expect(clientAddress({ peer: "::ffff:127.0.0.1", forwardedFor: "6.6.6.6", hops: 0 })).toBe("127.0.0.1");
  });

  it("reads the setting as a whole number of hops, 0 when unset or nonsense", () => {
    expect(trustedProxyHops(undefined)).toBe(0);
    expect(trustedProxyHops("2")).toBe(2);
    expect(trustedProxyHops("-1")).toBe(0);
    expect(trustedProxyHops("one")).toBe(0);
  });
});
