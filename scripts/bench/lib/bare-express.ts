// The reference for the request benches: one Express route in a process of its own, nothing else.
// Arguments: the port, and optionally the JSON body it answers with.
import express from 'express';

const body: unknown = process.argv[3] ? JSON.parse(process.argv[3]) : { ok: true };
const app = express();
app.disable('x-powered-by');
app.get('/bare', (_req, res) => void res.json(body));
const server = app.listen(Number(process.argv[2]), '127.0.0.1');
process.on('SIGTERM', () => server.close(() => process.exit(0)));
