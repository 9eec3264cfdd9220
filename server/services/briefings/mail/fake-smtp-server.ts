// A local SMTP server on loopback that keeps every message it receives and delivers nothing
// onward: the start command runs it so that development and tests never mail a real address,
// and admins read what was "sent" on the outbox page.
//
// STARTTLS is switched off: smtp-server would otherwise offer it with its built-in self-signed
// certificate, nodemailer would upgrade and then refuse that certificate. Any AUTH is accepted
// (over plain TCP, loopback only) so that an SMTP URL with a user name works unchanged.
import { SMTPServer } from 'smtp-server';
import { parseMessage, type ParsedMessage } from './parse-message';

export type ReceivedMessage = {
  /** 1, 2, 3… in arrival order. */
  id: number;
  receivedAt: Date;
  envelopeFrom: string | null;
  envelopeTo: string[];
  /** The message exactly as received (RFC 5322). */
  raw: Buffer;
  parsed: ParsedMessage;
};

export type FakeSmtpServer = {
  host: string;
  port: number;
  /** For nodemailer: smtp://127.0.0.1:PORT */
  url: string;
  messages: () => ReceivedMessage[];
  /** Resolves with the first kept message (already or later) that matches, or rejects after the timeout. */
  waitFor: (match: (m: ReceivedMessage) => boolean, timeoutMs?: number) => Promise<ReceivedMessage>;
  clear: () => void;
  close: () => Promise<void>;
};

export type FakeSmtpOptions = {
  /** 0 picks a free port. */
  port?: number;
  host?: '127.0.0.1' | '::1' | 'localhost';
  /** Called for each message before the server answers 250 (e.g. to store it); a throw answers 451. */
  onMessage?: (m: ReceivedMessage) => void | Promise<void>;
  /** Messages kept in memory; older ones are dropped first. */
  keep?: number;
  maxMessageBytes?: number;
};

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost']);

export async function startFakeSmtpServer(options: FakeSmtpOptions = {}): Promise<FakeSmtpServer> {
  const host = options.host ?? '127.0.0.1';
  // Typed to loopback already; checked again because configuration arrives as plain strings.
  if (!LOOPBACK.has(host)) throw new Error('the fake SMTP server listens on loopback only');
  const keep = options.keep ?? 500;
  const maxBytes = options.maxMessageBytes ?? 25 * 1024 * 1024;
  const kept: ReceivedMessage[] = [];
  const waiters = new Set<{ match: (m: ReceivedMessage) => boolean; resolve: (m: ReceivedMessage) => void }>();
  let nextId = 1;

  const server = new SMTPServer({
    name: 'cutline-outbox.localhost',
    banner: 'Cutline development outbox: messages are kept here and never delivered',
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    allowInsecureAuth: true,
    size: maxBytes,
    logger: false,
    onAuth(_auth, _session, callback) {
      callback(null, { user: 'outbox' });
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', (err) => callback(err));
      stream.on('end', () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(Object.assign(new Error('Message too large'), { responseCode: 552 }));
          return;
        }
        const raw = Buffer.concat(chunks);
        const message: ReceivedMessage = {
          id: nextId++,
          receivedAt: new Date(),
          envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          envelopeTo: session.envelope.rcptTo.map((r) => r.address),
          raw,
          parsed: parseMessage(raw),
        };
        Promise.resolve()
          .then(() => options.onMessage?.(message))
          .then(
          () => {
            kept.push(message);
            if (kept.length > keep) kept.splice(0, kept.length - keep);
            for (const w of waiters) if (w.match(message)) w.resolve(message);
            callback();
          },
          (err: unknown) => callback(Object.assign(new Error(`Could not keep the message: ${(err as Error).message}`), { responseCode: 451 })),
        );
      });
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : (options.port ?? 0);
  const urlHost = host === '::1' ? '[::1]' : host;

  return {
    host,
    port,
    url: `smtp://${urlHost}:${port}`,
    messages: () => [...kept],
    waitFor: (match, timeoutMs = 5000) => {
      const already = kept.find(match);
      if (already) return Promise.resolve(already);
      return new Promise((resolve, reject) => {
        const waiter = {
          match,
          resolve: (m: ReceivedMessage) => {
            clearTimeout(timer);
            waiters.delete(waiter);
            resolve(m);
          },
        };
        const timer = setTimeout(() => {
          waiters.delete(waiter);
          reject(new Error(`no matching message within ${timeoutMs} ms`));
        }, timeoutMs);
        waiters.add(waiter);
      });
    },
    clear: () => {
      kept.length = 0;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
