import 'server-only';
// Sends mail through nodemailer over real SMTP: the local fake in demo and tests, a real relay
// in production (SMTP_* settings).
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/env';

let transporter: Transporter | undefined;

function transport(): Transporter {
  if (!transporter) {
    const e = env();
    transporter = nodemailer.createTransport({
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      secure: e.SMTP_SECURE === 'true',
      auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? '' } : undefined,
      // The local fake speaks plain SMTP; a real relay negotiates TLS itself.
      ignoreTLS: e.SMTP_HOST === '127.0.0.1' || e.SMTP_HOST === 'localhost',
    });
  }
  return transporter;
}

export type OutgoingMail = {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: Array<{ filename: string; content: Buffer; contentType: string }>;
  /** A fixed Message-ID lets a resend be recognised as the same message (reminder outbox). */
  messageId?: string;
};

export async function sendMail(mail: OutgoingMail): Promise<{ messageId: string }> {
  const info = await transport().sendMail({ from: env().MAIL_FROM, ...mail });
  return { messageId: info.messageId };
}
