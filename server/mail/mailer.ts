import nodemailer from 'nodemailer';
import type { Config } from '../config';
import type { BrandForDocuments } from '../clinic/clinic-brand';
import { brandedFields } from './branded-mail';

/** One outgoing e-mail. Keep health data out of it: link into the app instead. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  /** The clinic the message is from: {@link brandingMailer} adds its letterhead. */
  clinicId?: number;
  /** The sending clinic's letterhead: logo and name on top, legal details at the foot. */
  brand?: BrandForDocuments;
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
      const { brand, clinicId: _clinic, ...plain } = message;
      await transport.sendMail({ from: mail.from, ...plain, ...(brand ? brandedFields(plain.text, brand) : {}) });
    },
    close() {
      transport.close();
    },
  };
}

function isLoopback(host: string): boolean {
  return host === 'localhost' || host.startsWith('127.') || host === '::1';
}

/**
 * Adds the sending clinic's letterhead (logo, name, legal details) to every message that names its
 * clinic; the inner mailer turns it into the HTML part and footer. A brand that cannot be read
 * leaves the message plain rather than unsent.
 */
export function brandingMailer(inner: Mailer, brandOf: (clinicId: number) => Promise<BrandForDocuments>): Mailer {
  return {
    async send(message) {
      if (message.clinicId === undefined || message.brand) return inner.send(message);
      const brand = await brandOf(message.clinicId).catch(() => undefined);
      return inner.send(brand ? { ...message, brand } : message);
    },
    close() {
      inner.close();
    },
  };
}
