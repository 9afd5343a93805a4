import http from 'node:http';
import type { RequestListener } from 'node:http';

/**
 * The HTTP server the app listens with. Idle keep-alive connections are kept for 65 s rather
 * than Node's 5 s: a client (or a load balancer, whose idle timeouts are commonly 60 s) that
 * reuses a connection the server is just closing gets a connection reset, and a busy event loop
 * fires the close late, right into the next request. Headers must still arrive within 66 s.
 */
export function createHttpServer(app: RequestListener): http.Server {
  const server = http.createServer(app);
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;
  return server;
}
