// The office issues the certificate of a submitted demo visit; the landlord gets it by e-mail,
// signs in through the e-mail link flow, downloads the PDF, and the QR code's URL shows "valid".
// Then the demo's valid, expired and void certificates on the phone, and their PDFs as images.
import fs from 'node:fs';
import type { Page } from '@playwright/test';
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage, waitForMail } from './pages';
import { pdfQrEncodes, pdfText, renderPdfPages } from './certificate-pdf';

const SHOTS = 'test-results/screens';
const PHONE_HEIGHT = 844;

/** The printed check URL: absolute, so a phone that scans it needs nothing else. */
const CHECK_URL = /check at (https?:\/\/\S+\/check\/[A-Za-z0-9_-]{43})/;

/** A verdict the reader must see first is on the first phone screen, without scrolling. */
async function expectAboveTheFold(page: Page, selector: ReturnType<Page['locator']>) {
  await page.evaluate(() => window.scrollTo(0, 0));
  const box = await selector.boundingBox();
  expect(box, 'element is rendered').not.toBeNull();
  expect(box!.y + box!.height).toBeLessThanOrEqual(PHONE_HEIGHT);
}

/** Nothing on the page is wider than the phone (a wide table scrolls inside its own box). */
async function expectNoSidewaysScroll(page: Page) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
}

async function shoot(page: Page, name: string) {
  await expectNoSidewaysScroll(page);
  await page.screenshot({ path: `${SHOTS}/cert-${name}.png`, fullPage: true });
}

test('office issues a certificate; the landlord receives, downloads and checks it', async ({ page, context }) => {
  // Many steps (issue and render a PDF, two e-mails, three sign-ins) on a shared, busy machine.
  test.setTimeout(180_000);
  fs.mkdirSync(SHOTS, { recursive: true });
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  // Going on before the sign-in answer lands would abandon it and meet the sign-in page again.
  await expect(page).toHaveURL(/\/office$/);
  await page.goto('/office/review');
  await expect(page.getByTestId('review-queue')).toBeVisible();
  await shoot(page, 'review-queue');

  // KB-1010 is the demo visit with a danger finding (flue spilling) and an overdue analyser.
  await page.getByTestId('review-item').filter({ hasText: 'KB-1010' }).click();
  await expect(page.getByTestId('review-visit')).toBeVisible();
  await expect(page.getByTestId('analyser-override').first()).toBeVisible();
  await expectAboveTheFold(page, page.getByTestId('review-visit').locator('[data-verdict="danger"]').first());
  await expectAboveTheFold(page, page.getByText('Danger found on this visit'));
  await page.screenshot({ path: `${SHOTS}/cert-review-visit-top.png` });
  await shoot(page, 'review-visit');

  await page.getByRole('button', { name: 'Issue certificate' }).click();
  await expect(page.getByTestId('certificate-page')).toBeVisible({ timeout: 30_000 });
  const numberText = (await page.getByTestId('certificate-number').textContent())!.trim();
  await expect(page.getByTestId('deliveries')).toContainText('dev.anand@harbourline.test');
  await expectAboveTheFold(page, page.getByTestId('certificate-page').locator('[data-verdict="danger"]').first());
  await shoot(page, 'issued');

  // The warning notice that goes out with this certificate, as the occupant would print it.
  const noticeHref = await page.locator('section[aria-labelledby="notices"] a').first().getAttribute('href');
  const notice = await page.request.get(noticeHref!);
  expect(notice.status()).toBe(200);
  const noticePdf = Buffer.from(await notice.body());
  expect(await pdfText(noticePdf)).toContain('DANGER: DO NOT USE');
  expect(renderPdfPages(noticePdf, SHOTS, 'cert-pdf-warning-notice')).toHaveLength(1);
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in/);

  const mail = await waitForMail(ACCOUNTS.landlord.email, numberText);
  expect(mail.attachments.map((a) => a.filename)).toContain(`certificate-${numberText}.pdf`);
  expect(mail.attachments.some((a) => a.filename.startsWith(`warning-notice-${numberText}-`))).toBe(true);
  const portalLink = mail.links.find((l) => l.includes('/portal/sites/'))!;
  expect(portalLink).toBeTruthy();

  // Following the e-mail's link while signed out leads to the sign-in page; the landlord asks for
  // a one-time link there and lands back on the property.
  await page.goto(new URL(portalLink).pathname);
  await signIn.askForLink(ACCOUNTS.landlord.email);
  const signInMail = await waitForMail(ACCOUNTS.landlord.email, 'sign-in link');
  await page.goto(signInMail.links.find((l) => l.includes('/api/auth/callback/email'))!);
  await expect(page).toHaveURL(new URL(portalLink).pathname);
  await expect(page.getByTestId('portal-site-page')).toBeVisible();
  await expect(page.locator('section[aria-labelledby="current"]')).toContainText(numberText);
  await expectAboveTheFold(page, page.locator('section[aria-labelledby="current"]').locator('[data-verdict="danger"]'));
  await expect(page.getByTestId('portal-outcome')).toContainText('must not be used until it has been repaired');
  await expectAboveTheFold(page, page.getByTestId('portal-outcome'));
  await shoot(page, 'portal-site');
  await page.goto('/portal');
  await expect(page.getByTestId('portal-site').first()).toBeVisible();
  await shoot(page, 'portal');
  await page.goto(new URL(portalLink).pathname);

  const download = await page.request.get((await page.getByTestId('download-current').getAttribute('href'))!);
  expect(download.status()).toBe(200);
  expect(download.headers()['content-disposition']).toContain(`certificate-${numberText}.pdf`);
  const pdf = Buffer.from(await download.body());
  expect(renderPdfPages(pdf, SHOTS, `cert-pdf-${numberText}`).length).toBeGreaterThan(0);
  const text = await pdfText(pdf);
  expect(text).toContain(numberText);
  expect(text).toContain('Something was found dangerous and made safe');
  const checkUrl = CHECK_URL.exec(text)![1]!;
  // The e-mail's "check" link is the same URL.
  expect(mail.links).toContain(checkUrl);
  // The QR code holds that URL: its modules equal a fresh encoding of it, and not of a URL with a
  // different token of the same length (so the comparison can tell codes apart).
  expect(await pdfQrEncodes(pdf, checkUrl)).toBe(true);
  const otherToken = checkUrl.replace(/.$/, (ch) => (ch === 'A' ? 'B' : 'A'));
  expect(await pdfQrEncodes(pdf, otherToken)).toBe(false);

  const stranger = await (await context.browser()!.newContext({ viewport: { width: 390, height: PHONE_HEIGHT } })).newPage();
  await stranger.goto(checkUrl);
  await expect(stranger.getByTestId('check-status')).toHaveAttribute('data-status', 'valid');
  await expect(stranger.getByTestId('check-number')).toHaveText(numberText);
  await shoot(stranger, 'check-valid');
  await stranger.context().close();
});

test('demo certificates: a valid, an expired and a void one, on the phone and as PDFs', async ({ page, context }) => {
  test.setTimeout(180_000);
  fs.mkdirSync(SHOTS, { recursive: true });
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  // Going on before the sign-in answer lands would abandon it and meet the sign-in page again.
  await expect(page).toHaveURL(/\/office$/);
  await page.goto('/office/certificates');
  await expect(page.getByTestId('certificates-page')).toBeVisible();
  await shoot(page, 'certificates');

  const stranger = await (await context.browser()!.newContext({ viewport: { width: 390, height: PHONE_HEIGHT } })).newPage();
  for (const status of ['valid', 'expired', 'void'] as const) {
    // The oldest of each kind, so a certificate the first test issued is not picked instead of the demo's own.
    const item = page.getByTestId('certificate-item').filter({ has: page.locator(`[data-status="${status}"]`) }).last();
    await expect(item, `the demo has a ${status} certificate`).toBeVisible();
    await item.click();
    await expect(page.getByTestId('certificate-page')).toBeVisible();
    const numberText = (await page.getByTestId('certificate-number').textContent())!.trim();
    await expect(page.getByTestId('certificate-page').locator(`[data-status="${status}"]`).first()).toBeVisible();
    if (status !== 'expired') await shoot(page, `certificate-${status}`);

    // The office's PDF: the stored original when current, the VOID-marked copy when void.
    const response = await page.request.get(`/api/v1/certificates/${page.url().split('/').pop()!.split('?')[0]}/pdf`);
    expect(response.status()).toBe(200);
    const pdf = Buffer.from(await response.body());
    const text = await pdfText(pdf);
    expect(text).toContain(numberText);
    if (status === 'void') expect(text).toContain('must not be relied on');
    else expect(text).not.toContain('VOID');
    if (status !== 'expired') expect(renderPdfPages(pdf, SHOTS, `cert-pdf-demo-${status}`).length).toBeGreaterThan(0);
    const checkUrl = CHECK_URL.exec(text)![1]!;
    expect(await pdfQrEncodes(pdf, checkUrl)).toBe(true);

    await stranger.goto(checkUrl);
    await expect(stranger.getByTestId('check-status')).toHaveAttribute('data-status', status);
    await expect(stranger.getByTestId('check-number')).toHaveText(numberText);
    await shoot(stranger, `check-${status}`);
    await page.goto('/office/certificates');
  }
  await stranger.context().close();
});
