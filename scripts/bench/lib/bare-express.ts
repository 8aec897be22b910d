// The reference for bench:api: one Express route in a process of its own, nothing else.
import express from 'express';

const app = express();
app.disable('x-powered-by');
app.get('/bare', (_req, res) => void res.json({ ok: true }));
const server = app.listen(Number(process.argv[2]), '127.0.0.1');
process.on('SIGTERM', () => server.close(() => process.exit(0)));
