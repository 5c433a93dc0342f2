import http from "node:http";

/** The header carrying the connection's own address to route handlers and actions. */
export const PEER_HEADER = "x-loopwright-peer";

/**
 * Next.js gives route handlers no socket address, and fills in X-Forwarded-For only when the
 * client has not sent one. So every incoming request gets the connection's address in our own
 * header, replacing anything the client sent under that name. Installed once per process by
 * instrumentation.ts, before the first request is handled.
 */
export function installPeerAddressHeader(): void {
  const proto = http.Server.prototype as http.Server & { loopwrightPeer?: boolean };
  if (proto.loopwrightPeer) return;
  proto.loopwrightPeer = true;
  const emit = proto.emit as (
    this: http.Server,
    event: string | symbol,
    ...args: unknown[]
  ) => boolean;
  proto.emit = function (this: http.Server, event: string | symbol, ...args: unknown[]) {
    if (event === "request") {
      const req = args[0] as http.IncomingMessage;
      req.headers[PEER_HEADER] = req.socket?.remoteAddress ?? "";
    }
    return emit.call(this, event, ...args);
  } as typeof proto.emit;
}
