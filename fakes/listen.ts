import type { AddressInfo, Server } from 'node:net';

/**
 * Starts a fake's server on the loopback interface at `port` (0 for any free one) and answers
 * the port it got; a failure to bind (the port taken) rejects.
 */
export function listen(server: Server, port: number): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve((server.address() as AddressInfo).port);
    });
  });
}
