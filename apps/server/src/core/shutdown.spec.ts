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
    app.get('/slow', (_req, res) => {
      setTimeout(() => res.send('finished'), 300);
    });
    const server = createServer(app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const { port } = server.address() as AddressInfo;

    const inFlight = get(port, '/slow');
    await new Promise((r) => setTimeout(r, 50));
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
