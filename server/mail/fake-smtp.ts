import { SMTPServer } from 'smtp-server';
import type { AddressObject } from 'mailparser';
import type { Db } from '../db/knex';

/** A running fake SMTP receiver. */
export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

/**
 * Starts a local SMTP receiver (demo and test mode only) on 127.0.0.1 that accepts any message
 * and stores it in `mailbox_messages`, where the demo inbox (`demo-inbox.ts`) shows it. The message is
 * stored before the SMTP "250 OK", so a sender whose `sendMail` resolved can read it at once.
 */
export async function startFakeSmtp(db: Db, port: number): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, _session, callback) {
      // mailparser (and its charset tables) loads with the first message, not with the server.
      import('mailparser')
        .then(({ simpleParser }) => simpleParser(stream))
        .then(async (mail) => {
          await db('mailbox_messages').insert({
            to_address: addressText(mail.to),
            from_address: addressText(mail.from),
            subject: mail.subject ?? '(no subject)',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : null,
            received_at: new Date().toISOString(),
          });
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const actualPort = typeof address === 'object' && address ? address.port : port;
  return {
    port: actualPort,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return '';
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ');
}
