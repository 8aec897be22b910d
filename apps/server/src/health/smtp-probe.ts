import { connect as connectTcp, type Socket } from 'node:net';
import { connect as connectTls } from 'node:tls';

export interface MailRelayAddress {
  host: string;
  port: number;
  /** TLS from the first byte (port 465); otherwise plain, as the relay greets before STARTTLS. */
  secure: boolean;
}

/**
 * Connects to the SMTP relay, waits for its 220 greeting and says QUIT: proof that the relay is
 * there and talking SMTP, without signing in or sending anything. Rejects on refusal, a greeting
 * other than 220, or no greeting within `timeoutMs`; the socket is always closed.
 */
export function probeSmtp(relay: MailRelayAddress, timeoutMs: number): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    let settled = false;
    let greeting = '';
    const socket: Socket = relay.secure
      ? connectTls({ host: relay.host, port: relay.port, servername: relay.host })
      : connectTcp({ host: relay.host, port: relay.port });
    const finish = (err?: Error) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      if (err) socket.destroy();
      else socket.end('QUIT\r\n');
      // A relay that never answers QUIT must not keep the socket open.
      setTimeout(() => socket.destroy(), 1000).unref();
      if (err) reject(err);
      else resolve();
    };
    const timer = setTimeout(() => {
      const err = new Error(`no SMTP greeting within ${timeoutMs} ms`);
      err.name = 'TimeoutError';
      finish(err);
    }, timeoutMs);
    socket.setEncoding('latin1');
    socket.on('error', (err) => finish(err));
    socket.on('close', () => finish(new Error('the relay closed the connection before greeting')));
    socket.on('data', (chunk: string) => {
      greeting += chunk;
      // A multi-line greeting ("220-…") ends with a line "220 …".
      const lines = greeting.split('\r\n');
      const last = [...lines].reverse().find((l) => /^\d{3} /.test(l));
      if (!last) {
        if (greeting.length > 4096) finish(new Error('the relay sent no SMTP greeting'));
        return;
      }
      if (last.startsWith('220 ')) finish();
      else finish(new Error(`the relay greeted with ${last.slice(0, 3)} instead of 220`));
    });
  });
}
