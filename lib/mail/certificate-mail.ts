import 'server-only';
// The certificate e-mail: to the landlord or homeowner with a link into the portal, and to the
// tenant (who has no account) with the PDF only. Each carries the PDF and the public check link.
import { sendMail } from './transport';
import { escapeHtml } from '@/lib/text';
import type { CertificateContent } from '@/lib/certificates/types';

export function portalSiteUrl(appUrl: string, siteId: string): string {
  return `${appUrl.replace(/\/+$/, '')}/portal/sites/${siteId}`;
}

function formatDate(iso: string): string {
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!)).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

const OUTCOME: Record<string, string> = {
  clear: 'Every appliance tested was within its limits.',
  service: 'Something needs a service or repair; the certificate says what.',
  danger: 'Something was found dangerous and was made safe; the certificate and the warning notice say what, and it must not be used until repaired.',
  unknown: 'Some figures could not be judged against a limit; the certificate says which.',
};

export async function sendCertificateMail(input: {
  to: string;
  name: string | null;
  kind: 'landlord' | 'homeowner' | 'tenant';
  content: CertificateContent;
  siteId: string;
  appUrl: string;
  pdf: Buffer;
  filename: string;
  notices: Array<{ filename: string; pdf: Buffer }>;
}): Promise<{ messageId: string }> {
  const c = input.content;
  const address = [c.site.addressLine1, c.site.addressLine2, c.site.town].filter(Boolean).join(', ');
  const lines: Array<string | { link: string; label: string }> = [
    `Hello ${input.name ?? 'there'},`,
    `${c.organisation.name} checked the gas and oil appliances at ${address} on ${formatDate(c.visit.date)}. Certificate ${c.numberText} is attached; it is valid until ${formatDate(c.expiresOn)}.`,
    OUTCOME[c.overall] ?? '',
    ...(input.notices.length ? ['A warning notice for each danger found is attached too. Please read it now.'] : []),
    ...(input.kind === 'tenant'
      ? ['You are receiving this because you live at the property. Keep it for your records.']
      : [
          { link: portalSiteUrl(input.appUrl, input.siteId), label: 'See the property, its certificates and book the next check' },
          'If you are not signed in, enter your e-mail address on the sign-in page and we send you a one-time sign-in link; no password needed.',
        ]),
    { link: c.checkUrl, label: 'Check that the certificate is genuine' },
    c.caution.join(' '),
  ].filter((l) => l !== '');
  const text = lines.map((l) => (typeof l === 'string' ? l : `${l.label}: ${l.link}`)).join('\n\n');
  const html = lines.map((l) => (typeof l === 'string' ? `<p>${escapeHtml(l)}</p>` : `<p><a href="${escapeHtml(l.link)}">${escapeHtml(l.label)}</a></p>`)).join('');
  return sendMail({
    to: input.to,
    subject: `Safety certificate ${c.numberText} for ${c.site.addressLine1}, ${c.site.town}`,
    text,
    html,
    attachments: [
      { filename: input.filename, content: input.pdf, contentType: 'application/pdf' },
      ...input.notices.map((n) => ({ filename: n.filename, content: n.pdf, contentType: 'application/pdf' })),
    ],
  });
}
