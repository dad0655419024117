// Billing end to end: the office raises and sends an invoice; the homeowner opens it from the
// e-mail in the local mailbox, signs in by link, is declined with one test card on the local payment
// fake, pays with the other, comes back to see it paid and gets a receipt; the office refunds part.
import type { Browser, Page } from '@playwright/test';
import { test, expect, ACCOUNTS, MAIL_API } from './fixtures';
import { SignInPage } from './pages';
import { demoIds } from '../../seeds/demo-support';

const CARDS = { succeeds: '4242 4242 4242 4242', declined: '4000 0000 0000 0002' };
const SHOTS = 'test-results/screens';

type MailSummary = { id: string; subject: string };
type Mail = { id: string; subject: string; links: string[]; attachments: Array<{ filename: string; contentType: string }> };

/** Ids of the messages already in the mailbox for `to`, so a wait can skip them. */
async function seenMail(to: string): Promise<Set<string>> {
  const list = (await (await fetch(`${MAIL_API}/messages?to=${encodeURIComponent(to)}`)).json()) as MailSummary[];
  return new Set(list.map((m) => m.id));
}

/** The first message to `to` with `subject` in its subject that is not in `seen`. */
async function newMail(input: { to: string; subject: string; seen: Set<string> }): Promise<Mail> {
  const until = Date.now() + 20_000;
  while (Date.now() < until) {
    const list = (await (await fetch(`${MAIL_API}/messages?to=${encodeURIComponent(input.to)}`)).json()) as MailSummary[];
    const hit = list.find((m) => m.subject.includes(input.subject) && !input.seen.has(m.id));
    if (hit) {
      input.seen.add(hit.id);
      return (await (await fetch(`${MAIL_API}/messages/${hit.id}`)).json()) as Mail;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no new mail to ${input.to} with "${input.subject}"`);
}

async function officePage(browser: Browser): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await expect(page).toHaveURL(/\/office$/);
  return page;
}

test.describe('invoices and card payments', () => {
  test('a homeowner pays the e-mailed invoice by card after one decline, and gets a receipt; the office refunds part', async ({ page, browser }) => {
    test.setTimeout(150_000);
    const homeowner = ACCOUNTS.homeowner.email;
    const seen = await seenMail(homeowner);

    // The office raises the invoice from the homeowner's visit and sends it.
    const office = await officePage(browser);
    await office.getByRole('link', { name: 'Invoices', exact: true }).first().click();
    await expect(office.getByRole('heading', { name: 'Invoices', level: 1 })).toBeVisible();
    await expect(office.getByTestId('invoices-row').first()).toBeVisible();
    await office.screenshot({ path: `${SHOTS}/billing-office-invoices.png`, fullPage: true });
    await office.goto(`/office/invoices/new?visit=${demoIds.visit(26, 0)}`);
    await expect(office.getByLabel('Who pays')).toContainText('Hal Brennick');
    await office.getByLabel(/CO alarm supplied and fitted/).fill('1');
    await expect(office.getByTestId('invoice-preview')).toContainText('CO alarm supplied and fitted');
    await office.screenshot({ path: `${SHOTS}/billing-office-raise.png`, fullPage: true });
    await office.getByRole('button', { name: 'Save as draft' }).click();
    await expect(office.getByRole('heading', { name: /^Invoice KHS-\d{6}$/ })).toBeVisible();
    const number = ((await office.getByRole('heading', { name: /^Invoice KHS-/ }).textContent()) ?? '').replace('Invoice ', '');
    const total = (await office.getByTestId('invoice-total').textContent()) ?? '';
    await office.getByRole('button', { name: 'Send to payer' }).click();
    await expect(office.getByText(`Sent to ${homeowner}`)).toBeVisible();
    await expect(office.locator('[data-status="sent"]').first()).toBeVisible();
    await office.screenshot({ path: `${SHOTS}/billing-office-invoice.png`, fullPage: true });

    // The homeowner follows the link in the e-mail, and signs in by e-mail link on the way.
    const invoiceMail = await newMail({ to: homeowner, subject: number, seen });
    expect(invoiceMail.attachments[0]).toMatchObject({ filename: `invoice-${number}.pdf`, contentType: 'application/pdf' });
    const invoiceLink = invoiceMail.links.find((l) => l.includes('/portal/invoices/'));
    expect(invoiceLink).toBeTruthy();
    await page.goto(invoiceLink!);
    await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Fportal%2Finvoices%2F/);
    await new SignInPage(page).askForLink(homeowner);
    const signInMail = await newMail({ to: homeowner, subject: 'sign-in link', seen });
    await page.goto(signInMail.links.find((l) => l.includes('/api/auth/callback/email'))!);
    await expect(page).toHaveURL(/\/portal\/invoices\/[0-9a-f-]{36}$/);
    await expect(page.getByRole('heading', { name: `Invoice ${number}` })).toBeVisible();
    await expect(page.locator('[data-status="sent"]')).toBeVisible();
    await page.screenshot({ path: `${SHOTS}/billing-portal-invoice.png`, fullPage: true });

    // The declined test card: the fake says so, and back on the invoice it is still unpaid, with the reason.
    await page.getByRole('button', { name: `Pay ${total} by card` }).click();
    await expect(page.getByRole('heading', { name: 'Test card payment (local fake)' })).toBeVisible();
    await page.getByLabel('Card number').fill(CARDS.declined);
    await page.getByRole('button', { name: /^Pay / }).click();
    await expect(page.getByText('Your card was declined.')).toBeVisible();
    await page.screenshot({ path: `${SHOTS}/billing-checkout-declined.png`, fullPage: true });
    await page.getByRole('link', { name: 'Cancel and return to the site' }).click();
    await expect(page).toHaveURL(/checkout=cancelled/);
    // Filtered: Next's route announcer is an empty alert region too.
    const declined = page.getByRole('alert').filter({ hasText: 'Your card payment did not go through' });
    await expect(declined).toContainText('Your card was declined. Nothing was charged.');
    await expect(page.locator('[data-status="sent"]')).toBeVisible();
    await page.screenshot({ path: `${SHOTS}/billing-portal-declined.png`, fullPage: true });

    // The succeeding test card: back on the invoice it shows paid, and the receipt arrives.
    await page.getByRole('button', { name: `Pay ${total} by card` }).click();
    await page.getByLabel('Card number').fill(CARDS.succeeds);
    await page.getByRole('button', { name: /^Pay / }).click();
    await expect(page).toHaveURL(/\/portal\/invoices\/[0-9a-f-]{36}\?checkout=done$/);
    await expect(page.getByText('Payment received, thank you')).toBeVisible();
    await expect(page.locator('[data-status="paid"]')).toBeVisible();
    await expect(page.getByRole('button', { name: /by card/ })).toHaveCount(0);
    await page.screenshot({ path: `${SHOTS}/billing-portal-paid.png`, fullPage: true });
    const receipt = await newMail({ to: homeowner, subject: 'Receipt', seen });
    expect(receipt.subject).toContain(number);
    expect(receipt.attachments[0]).toMatchObject({ contentType: 'application/pdf' });

    await page.getByRole('link', { name: 'Invoices', exact: true }).first().click();
    await expect(page.getByTestId('portal-invoice').filter({ hasText: number })).toContainText('Paid');
    await page.screenshot({ path: `${SHOTS}/billing-portal-list.png`, fullPage: true });

    // The office sees it paid and refunds part; the confirmation comes back through the webhook.
    await office.reload();
    await expect(office.locator('[data-status="paid"]').first()).toBeVisible();
    await expect(office.getByTestId('payment-events')).toContainText('Card payment received');
    await office.getByLabel(/Amount to refund/).fill('10.00');
    await office.getByRole('button', { name: 'Refund', exact: true }).click();
    await expect(office.getByText('The payment service confirmed the refund.')).toBeVisible({ timeout: 20_000 });
    await expect(office.locator('[data-status="partly_refunded"]').first()).toBeVisible();
    await office.screenshot({ path: `${SHOTS}/billing-office-refunded.png`, fullPage: true });
    await newMail({ to: homeowner, subject: 'Refund of £10.00', seen });
  });

  test('the office keeps the price list', async ({ browser }) => {
    const office = await officePage(browser);
    await office.goto('/office/prices');
    await expect(office.getByRole('heading', { name: 'Prices and tax' })).toBeVisible();
    await office.getByLabel('Tax rate (%)').fill('twenty');
    await office.getByRole('button', { name: 'Save prices' }).click();
    await expect(office.getByText('Enter a rate like 20 or 17.5')).toBeVisible();
    await office.getByLabel('Tax rate (%)').fill('20');
    await office.getByRole('button', { name: 'Save prices' }).click();
    await expect(office.getByText('Prices saved.')).toBeVisible();
    await office.screenshot({ path: `${SHOTS}/billing-office-prices.png`, fullPage: true });
  });
});
