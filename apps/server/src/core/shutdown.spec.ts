import { createServer, request } from 'node:http';
import type { AddressInfo } from 'node:net';
import express from 'express';
import { gracefulShutdown } from './shutdown';

function get(port: number, path: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path, agent: false }, (res) => {
      let body = '';
      res.on('data', (c: Buffer) => (body += c.toString()));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('graceful shutdown', () => {
  it('finishes a request in flight, refuses new connections, then runs the cleanup', async () => {
    const app = express();
    // "In flight" means the server has the request: a connection whose request has not been read
    // yet is idle to Node and is closed at once (a fixed wait here lost that race under load).
    let arrived!: () => void;
    const inHandler = new Promise<void>((r) => (arrived = r));
    app.get('/slow', (_req, res) => {
      arrived();
      setTimeout(() => res.send('finished'), 300);
    });
    const server = createServer(app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const { port } = server.address() as AddressInfo;

    const inFlight = get(port, '/slow');
    await inHandler;
    let cleaned = false;
    const stopped = gracefulShutdown(server, 5000, async () => {
      cleaned = true;
    });

    await expect(get(port, '/slow')).rejects.toThrow(/ECONNREFUSED/);
    await expect(inFlight).resolves.toEqual({ status: 200, body: 'finished' });
    await stopped;
    expect(cleaned).toBe(true);
  });
});
