import "server-only";
import http from "node:http";
import { PEER_HEADER } from "../limits/client-address";

const STAMPED = Symbol.for("prooflight.peerStamped");

/**
 * Next keeps a client-sent X-Forwarded-For as it is, so the app cannot tell the TCP peer from a
 * header a client wrote. Before any handler sees a request, this overwrites our own peer header
 * with the socket's address. Patched once per process, on the prototype every HTTP server uses.
 */
export function stampPeerAddress(): void {
  const proto = http.Server.prototype as unknown as { emit: (...a: unknown[]) => boolean; [STAMPED]?: boolean };
  if (proto[STAMPED]) return;
  const emit = proto.emit;
  proto.emit = function (this: unknown, event: unknown, ...rest: unknown[]) {
    if (event === "request") {
      const req = rest[0] as http.IncomingMessage;
      req.headers[PEER_HEADER] = req.socket?.remoteAddress ?? "";
    }
    return emit.call(this, event, ...rest);
  };
  proto[STAMPED] = true;
}
