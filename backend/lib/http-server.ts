import type { Server } from "node:http";

/**
 * Keep-alive longer than any client or proxy keeps an idle connection. With Node's default (5 s)
 * a client could reuse a pooled connection in the instant the server closed it, and its next
 * request failed with ECONNRESET; fetch (undici) drops idle connections after 4 s, proxies usually
 * after 60 s, so the server now waits 65 s and always lets the client close first. The headers
 * timeout must stay above the keep-alive timeout.
 */
export function keepConnectionsLonger(server: Server): Server {
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;
  return server;
}
