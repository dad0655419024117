// The office issues the certificate of a submitted demo visit; the landlord gets it by e-mail,
// signs in through the e-mail link flow, downloads the PDF, and the QR code's URL shows "valid".
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { extractText, getDocumentProxy } from 'unpdf';
import { test, expect, ACCOUNTS, MAIL_API } from './fixtures';
import { SignInPage, waitForMail } from './pages';

const SHOTS = 'test-results/screens';

test('office issues a certificate; the landlord receives, downloads and checks it', async ({ page, context }) => {
  fs.mkdirSync(SHOTS, { recursive: true });
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await page.goto('/office/review');
  await page.screenshot({ path: `${SHOTS}/cert-review-queue.png`, fullPage: true });
  await page.getByTestId('review-item').filter({ hasText: 'KB-1010' }).click();
  await expect(page.getByTestId('review-visit')).toBeVisible();
  await expect(page.getByTestId('analyser-override').first()).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/cert-review-visit.png`, fullPage: true });
  await page.getByRole('button', { name: 'Issue certificate' }).click();
  await expect(page.getByTestId('certificate-page')).toBeVisible({ timeout: 30_000 });
  const numberText = (await page.getByTestId('certificate-number').textContent())!.trim();
  await expect(page.getByTestId('deliveries')).toContainText('dev.anand@harbourline.test');
  await page.screenshot({ path: `${SHOTS}/cert-issued.png`, fullPage: true });
  await page.getByRole('button', { name: 'Sign out' }).click();

  const mail = await waitForMail(ACCOUNTS.landlord.email, numberText);
  expect(mail.attachments.map((a) => a.filename)).toContain(`certificate-${numberText}.pdf`);
  const portalLink = mail.links.find((l) => l.includes('/portal/sites/'))!;
  expect(portalLink).toBeTruthy();

  await page.goto(new URL(portalLink).pathname);
  await signIn.askForLink(ACCOUNTS.landlord.email);
  const signInMail = await waitForMail(ACCOUNTS.landlord.email, 'sign-in link');
  await page.goto(signInMail.links.find((l) => l.includes('/api/auth/callback/email'))!);
  await page.goto(new URL(portalLink).pathname);
  await expect(page.getByTestId('portal-site-page')).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/cert-portal-site.png`, fullPage: true });

  const download = await page.request.get((await page.getByTestId('download-current').getAttribute('href'))!);
  expect(download.status()).toBe(200);
  const pdf = Buffer.from(await download.body());
  const pdfPath = `${SHOTS}/cert-${numberText}.pdf`;
  fs.writeFileSync(pdfPath, pdf);
  execFileSync('pdftoppm', ['-r', '70', '-png', pdfPath, path.join(SHOTS, `cert-pdf-${numberText}`)]);
  const { text } = await extractText(await getDocumentProxy(new Uint8Array(pdf)), { mergePages: true });
  expect(text).toContain(numberText);
  const checkUrl = /check at (\S+\/check\/[A-Za-z0-9_-]{43})/.exec(text.replace(/\s+/g, ' '))![1]!;

  const stranger = await context.browser()!.newPage();
  await stranger.goto(checkUrl);
  await expect(stranger.getByTestId('check-status')).toHaveAttribute('data-status', 'valid');
  await expect(stranger.getByTestId('check-number')).toHaveText(numberText);
  await stranger.screenshot({ path: `${SHOTS}/cert-check-valid.png`, fullPage: true });
  await stranger.close();
  void MAIL_API;
});
