// Outgoing mail through nodemailer. Without SMTP_URL (development and test) the API starts an
// SMTP fake on 127.0.0.1 in the same process and stores each message it receives in the
// captured_mail table, where an admin can read it in the app.
import type { AddressInfo } from 'node:net';
import nodemailer, { type Transporter } from 'nodemailer';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Db } from '@resonote/db/client';
import { capturedMail } from '@resonote/db/schema';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** The port of the in-process SMTP fake, when it runs. */
  capturePort?: number;
  close(): Promise<void>;
}

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  if (!value) return [];
  const list = Array.isArray(value) ? value : [value];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '')).filter(Boolean);
}

async function startCapture(db: Db, port: number): Promise<SMTPServer & { port: number }> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    async onData(stream, _session, callback) {
      try {
        const parsed = await simpleParser(stream);
        await db.insert(capturedMail).values({
          fromAddress: addresses(parsed.from)[0] ?? '',
          toAddresses: addresses(parsed.to),
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : null,
        });
        callback();
      } catch (err) {
        callback(err as Error);
      }
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = (server as unknown as { server: { address(): AddressInfo } }).server.address();
  return Object.assign(server, { port: address.port });
}

export async function createMailer(options: { db: Db; smtpUrl?: string; capturePort: number; from: string }): Promise<Mailer> {
  let capture: (SMTPServer & { port: number }) | undefined;
  let transport: Transporter;
  if (options.smtpUrl) {
    transport = nodemailer.createTransport(options.smtpUrl);
  } else {
    capture = await startCapture(options.db, options.capturePort);
    transport = nodemailer.createTransport({ host: '127.0.0.1', port: capture.port, secure: false, ignoreTLS: true });
  }
  return {
    capturePort: capture?.port,
    async send(mail) {
      await transport.sendMail({ from: options.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    },
    async close() {
      transport.close();
      if (capture) await new Promise<void>((resolve) => capture!.close(() => resolve()));
    },
  };
}
