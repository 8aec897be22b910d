import type { Server } from 'node:http';

/**
 * Stops accepting connections, lets requests in flight finish, then runs `cleanup`. Idle
 * keep-alive sockets close at once; sockets still busy after `graceMs` are cut.
 */
export function gracefulShutdown(server: Server, graceMs: number, cleanup: () => Promise<void>): Promise<void> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => server.closeAllConnections(), graceMs);
    timer.unref();
    server.close(() => {
      clearTimeout(timer);
      cleanup().then(resolve, reject);
    });
    server.closeIdleConnections();
  });
}
