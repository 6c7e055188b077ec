import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { Db } from '../db/client';
import { caughtMail } from '../db/schema';

export interface MailCatcher {
  port: number;
  /** Makes the catcher refuse every message (to test what happens when mail fails). */
  setRefusing(refuse: boolean): void;
  close(): Promise<void>;
}

const addresses = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((x) => x.value.map((v) => v.address ?? '')).filter(Boolean).join(', ');

/**
 * With no SMTP server configured, mail goes to this small SMTP server on 127.0.0.1, which keeps
 * every message in the database for the admin's mail page.
 */
export async function startMailCatcher(db: Db, port = 0): Promise<MailCatcher> {
  let refusing = false;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        if (refusing) return callback(Object.assign(new Error('Mailbox unavailable (refusing for a test)'), { responseCode: 451 }));
        const raw = Buffer.concat(chunks).toString('utf8');
        simpleParser(raw)
          .then((m) =>
            db.insert(caughtMail).values({
              to: addresses(m.to),
              from: addresses(m.from),
              subject: m.subject ?? '(no subject)',
              raw,
            }),
          )
          .then(() => callback(), (e: Error) => callback(e));
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address() as { port: number };
  return {
    port: address.port,
    setRefusing: (r) => {
      refusing = r;
    },
    close: () => new Promise<void>((r) => server.close(() => r())),
  };
}
