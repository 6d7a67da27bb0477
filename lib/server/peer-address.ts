import "server-only";
import http from "node:http";
import { forwardedForOnArrival, PEER_MARKER_HEADER, peerMarker, trustedHops } from "./client-address";

/**
 * Rewrites X-Forwarded-For of every incoming HTTP request from its socket before Next sees it (see
 * client-address.ts). Installed once per process from instrumentation.ts; `http.Server` emits each
 * request through this method, so the server Next already created is covered too.
 */
export function installPeerAddress(): void {
  const proto = http.Server.prototype as unknown as { emit: (event: string, ...args: unknown[]) => boolean; __pwPeer?: boolean };
  if (proto.__pwPeer) return;
  proto.__pwPeer = true;
  const emit = proto.emit;
  const marker = peerMarker();
  proto.emit = function (this: http.Server, event: string, ...args: unknown[]) {
    if (event === "request") {
      const req = args[0] as http.IncomingMessage;
      req.headers["x-forwarded-for"] = forwardedForOnArrival(req.headers["x-forwarded-for"], req.socket?.remoteAddress, trustedHops());
      req.headers[PEER_MARKER_HEADER] = marker;
    }
    return emit.call(this, event, ...args);
  };
}
