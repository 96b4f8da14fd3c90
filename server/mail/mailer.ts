import nodemailer from 'nodemailer';
import type { Config } from '../config';

/** One outgoing e-mail. Keep health data out of it: link into the app instead. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
}

/** The seam every part of the server sends mail through. */
export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** Sends over SMTP with nodemailer: the fake receiver in demo/test, a real relay by configuration. */
export function createSmtpMailer(mail: Config['mail']): Mailer {
  const transport = nodemailer.createTransport({
    host: mail.host,
    port: mail.port,
    secure: mail.secure,
    auth: mail.user ? { user: mail.user, pass: mail.pass ?? '' } : undefined,
    // The local fake receiver speaks plain SMTP; real relays negotiate STARTTLS as usual.
    ignoreTLS: !mail.user && !mail.secure && isLoopback(mail.host),
  });
  return {
    async send(message) {
      await transport.sendMail({ from: mail.from, ...message });
    },
    close() {
      transport.close();
    },
  };
}

function isLoopback(host: string): boolean {
  return host === 'localhost' || host.startsWith('127.') || host === '::1';
}
