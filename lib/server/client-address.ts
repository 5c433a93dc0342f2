import "server-only";
import { env } from "@/lib/env";
import { PEER_HEADER } from "./peer-address";

/**
 * The client's address for rate limits. With TRUSTED_PROXY_HOPS=0 (the default) X-Forwarded-For
 * is ignored, since anyone can send it, and the connection's own address is used. With N trusted
 * proxies in front, each appends the address it saw, so the client is the Nth entry from the
 * right; entries further left were written by the client and are never trusted.
 */
export function clientAddress(headers: Headers, hops = env().TRUSTED_PROXY_HOPS): string {
  const peer = headers.get(PEER_HEADER)?.trim() || "unknown";
  if (hops === 0) return peer;
  const chain = (headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  if (chain.length === 0) return peer;
  return chain[Math.max(0, chain.length - hops)]!;
}
