import { randomBytes } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server as HttpServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

/** One message as the fake keeps it and the development outbox shows it. */
export interface CaughtMessage {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** What was attached, by name, type and size (the bytes stay out of the outbox). */
  attachments: Array<{ filename: string | null; contentType: string; size: number }>;
}

export interface FakeSmtpOptions {
  /** SMTP port on 127.0.0.1; 0 (the default) lets the system pick. */
  port?: number;
  /** Port of the JSON outbox API on 127.0.0.1; 0 picks one, null serves none. */
  httpPort?: number | null;
  /** Where each message is also kept as JSON, so the outbox survives restarts; memory only when absent. */
  directory?: string;
}

export interface FakeSmtp {
  port: number;
  httpPort: number | null;
  /** Every message received, oldest first (a live view). */
  messages: CaughtMessage[];
  /** Resolves with the first message (already received or still to come) that matches. */
  waitFor(match: (m: CaughtMessage) => boolean, timeoutMs?: number): Promise<CaughtMessage>;
  clear(): void;
  env: Record<string, string>;
  stop(): Promise<void>;
}

/**
 * A fake SMTP server on loopback. Each message is parsed and stored BEFORE the server answers
 * "250", so a sender's sendMail resolves only once the message can be read here.
 */
export async function startFakeSmtp(opts: FakeSmtpOptions = {}): Promise<FakeSmtp> {
  const directory = opts.directory ? path.resolve(opts.directory) : undefined;
  if (directory) mkdirSync(directory, { recursive: true });
  const messages: CaughtMessage[] = directory ? loadMessages(directory) : [];
  const waiters = new Set<{ match: (m: CaughtMessage) => boolean; resolve: (m: CaughtMessage) => void }>();

  const smtp = new SMTPServer({
    // Plain SMTP on loopback: no STARTTLS offered, any login accepted (and none needed).
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    onAuth: (_auth, _session, cb) => cb(null, { user: 'local' }),
    banner: 'Trabeate local mail catcher',
    size: 50 * 1024 * 1024,
    closeTimeout: 500,
    logger: false,
    onData(stream, session, cb) {
      simpleParser(stream)
        .then((parsed) => {
          const msg: CaughtMessage = {
            id: `${Date.now().toString(36)}-${randomBytes(4).toString('hex')}`,
            receivedAt: new Date().toISOString(),
            envelope: {
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              to: session.envelope.rcptTo.map((r) => r.address),
            },
            messageId: parsed.messageId ?? null,
            from: parsed.from?.text ?? '',
            to: addresses(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
            attachments: parsed.attachments.map((a) => ({
              filename: a.filename ?? null,
              contentType: a.contentType,
              size: a.size,
            })),
          };
          if (directory) writeFileSync(path.join(directory, `${msg.id}.json`), JSON.stringify(msg, null, 2));
          messages.push(msg);
          for (const w of waiters) {
            if (w.match(msg)) {
              waiters.delete(w);
              w.resolve(msg);
            }
          }
          cb();
        })
        .catch((err: Error) => cb(err));
    },
  });
  smtp.on('error', () => undefined); // a client dropping the line is not our failure

  await new Promise<void>((resolve, reject) => {
    smtp.server.once('error', reject);
    smtp.listen(opts.port ?? 0, '127.0.0.1', () => {
      smtp.server.off('error', reject);
      resolve();
    });
  });
  const port = (smtp.server.address() as AddressInfo).port;

  const clear = () => {
    messages.length = 0;
    if (directory)
      for (const f of readdirSync(directory)) if (f.endsWith('.json')) rmSync(path.join(directory, f), { force: true });
  };

  let http: HttpServer | undefined;
  let httpPort: number | null = null;
  if (opts.httpPort !== null) {
    http = createServer((req, res) => {
      const url = new URL(req.url ?? '/', 'http://127.0.0.1');
      const send = (status: number, body: unknown) => {
        res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store' });
        res.end(JSON.stringify(body));
      };
      if (url.pathname === '/messages' && req.method === 'GET') {
        // Newest first, without the bodies: the outbox list needs only the headers.
        return send(
          200,
          messages
            .slice()
            .reverse()
            .map(({ html: _h, text: _t, ...summary }) => summary),
        );
      }
      if (url.pathname === '/messages' && req.method === 'DELETE') {
        clear();
        return send(200, { deleted: true });
      }
      const one = /^\/messages\/([\w-]+)$/.exec(url.pathname);
      if (one && req.method === 'GET') {
        const msg = messages.find((m) => m.id === one[1]);
        return msg ? send(200, msg) : send(404, { error: { code: 'not_found', message: 'No such message' } });
      }
      if (url.pathname === '/health') return send(200, { ok: true });
      return send(404, { error: { code: 'not_found', message: 'Unknown outbox route' } });
    });
    await new Promise<void>((resolve, reject) => {
      http!.once('error', reject);
      http!.listen(opts.httpPort ?? 0, '127.0.0.1', () => resolve());
    });
    httpPort = (http.address() as AddressInfo).port;
  }

  return {
    port,
    httpPort,
    messages,
    clear,
    waitFor: (match, timeoutMs = 10_000) =>
      new Promise<CaughtMessage>((resolve, reject) => {
        const found = messages.find(match);
        if (found) return resolve(found);
        const waiter = {
          match,
          resolve: (m: CaughtMessage) => {
            clearTimeout(timer);
            resolve(m);
          },
        };
        const timer = setTimeout(() => {
          waiters.delete(waiter);
          reject(new Error(`no matching message arrived within ${timeoutMs} ms (${messages.length} received)`));
        }, timeoutMs);
        waiters.add(waiter);
      }),
    env: {
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(port),
      SMTP_SECURE: 'false',
      ...(httpPort !== null ? { MAIL_OUTBOX_URL: `http://127.0.0.1:${httpPort}` } : {}),
    },
    stop: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      if (http) {
        http.closeAllConnections();
        await new Promise<void>((resolve) => http!.close(() => resolve()));
      }
    },
  };
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const list = Array.isArray(field) ? field : [field];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '').filter(Boolean));
}

function loadMessages(directory: string): CaughtMessage[] {
  const out: CaughtMessage[] = [];
  for (const f of readdirSync(directory)
    .filter((f) => f.endsWith('.json'))
    .sort()) {
    try {
      out.push(JSON.parse(readFileSync(path.join(directory, f), 'utf8')) as CaughtMessage);
    } catch {
      // a half-written file from a crash: skip it rather than refuse to start
    }
  }
  return out.sort((a, b) => a.receivedAt.localeCompare(b.receivedAt));
}
