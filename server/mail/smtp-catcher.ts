import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import type { Logger } from 'pino';
import { readMime } from './read-mime.js';

/** Where a caught message goes (one call per recipient). */
export type StoreMail = (mail: { to: string; from: string; subject: string; text: string; html: string | null }) => Promise<void>;

export interface SmtpCatcher {
  /** smtp://127.0.0.1:<port> for the mailer. */
  url: string;
  close(): Promise<void>;
}

const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

/**
 * A local SMTP server on 127.0.0.1 that accepts every message and stores it (the
 * outbox), used when no SMTP_URL is configured: reset links stay readable in the app
 * instead of going nowhere.
 */
export async function startSmtpCatcher(store: StoreMail, logger: Logger): Promise<SmtpCatcher> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: 'Cogbook mail catcher',
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => {
        const mail = readMime(Buffer.concat(chunks).toString('utf8'));
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
        Promise.all(session.envelope.rcptTo.map((r) => store({ to: r.address.toLowerCase(), from, ...mail })))
          .then(() => callback())
          .catch((error: unknown) => {
            logger.error({ err: error }, 'mail catcher could not store a message');
            callback(error instanceof Error ? error : new Error(String(error)));
          });
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  const { port } = server.server.address() as AddressInfo;
  return {
    url: `smtp://127.0.0.1:${port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
