import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import type { Db } from '../db/client.js';
import { mailMessages } from '../db/schema.js';

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

/**
 * A local SMTP server (real protocol, 127.0.0.1 only) that stores every message it receives in
 * SQLite, so development, the demo and the tests exercise the same nodemailer path as production.
 * STARTTLS is disabled because the fake has no certificate (STACK.md pitfall 11).
 */
export async function startFakeSmtp(db: Db, port = 0): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks);
        simpleParser(raw)
          .then((mail) => {
            db.insert(mailMessages)
              .values({
                sender: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
                recipients: session.envelope.rcptTo.map((r) => r.address).join(', '),
                subject: mail.subject ?? '',
                textBody: mail.text ?? '',
                htmlBody: typeof mail.html === 'string' ? mail.html : null,
                raw: raw.toString('utf8'),
              })
              .run();
            callback();
          })
          .catch((err: Error) => callback(err));
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
