import 'server-only';
// The e-mail that carries a one-time sign-in link to a landlord or homeowner.
import { sendMail } from './transport';
import { escapeHtml } from '@/lib/text';

export async function sendSignInLink(input: { to: string; name: string; url: string }): Promise<void> {
  const text = [
    `Hello ${input.name},`,
    '',
    'Use this link to sign in to Hearthmark and see your certificates and invoices:',
    input.url,
    '',
    'The link works once and expires in 24 hours. If you did not ask for it, ignore this message.',
  ].join('\n');
  const html = `<p>Hello ${escapeHtml(input.name)},</p><p>Use this link to sign in to Hearthmark and see your certificates and invoices:</p><p><a href="${escapeHtml(input.url)}">Sign in to Hearthmark</a></p><p>The link works once and expires in 24 hours. If you did not ask for it, ignore this message.</p>`;
  await sendMail({ to: input.to, subject: 'Your Hearthmark sign-in link', text, html });
}
