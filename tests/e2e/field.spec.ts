// The field app on a phone: after one online load, a whole visit is recorded with the network off
// (two appliances with readings, one at danger so the make-safe steps are forced, a photo and the
// signature), survives a reload while offline, syncs when the network returns, and the office sees
// the submitted visit with the same verdicts. Screenshots of each step go to test-results/screens/.
import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage } from './pages';
import type { Locator, Page } from '@playwright/test';

// Seeds/01-demo-core.ts: today's first visit is Priya's, at site 3 (KB-1004), with an open-flued
// gas fire, a warm-air heater and an open-flued boiler.
const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
const demoUuid = (prefix: number, a: number, b: number) => `${hex(prefix, 8)}-${hex(a, 4)}-4${hex(b, 3)}-8000-${hex(a * 1000 + b, 12)}`;
const VISIT = demoUuid(7, 3, 1);
const GAS_FIRE = demoUuid(5, 3, 0);
const WARM_AIR = demoUuid(5, 3, 1);
const BOILER = demoUuid(5, 3, 2);

test.use({ viewport: { width: 360, height: 740 }, hasTouch: false });

const shot = (page: Page, name: string) => page.screenshot({ path: `test-results/screens/field-${name}.png`, fullPage: false });

class FieldVisit {
  constructor(private readonly page: Page) {}

  async open(part: string) {
    await this.page.evaluate((hash) => {
      window.location.hash = hash;
    }, part);
  }

  reading(testPoint: 'high_fire' | 'low_fire' | 'as_left'): Locator {
    return this.page.getByTestId(`reading-${testPoint}`);
  }

  async typeReading(testPoint: 'high_fire' | 'low_fire' | 'as_left', values: { co: string; co2: string; o2: string; flue: string; air: string }) {
    const card = this.reading(testPoint);
    await card.getByLabel('CO ppm', { exact: true }).fill(values.co);
    await card.getByLabel('CO2 %', { exact: true }).fill(values.co2);
    await card.getByLabel('O2 %', { exact: true }).fill(values.o2);
    await card.getByLabel(/^Flue temp\./).fill(values.flue);
    await card.getByLabel(/^Air temp\./).fill(values.air);
  }

  async record(testPoint: 'high_fire' | 'low_fire' | 'as_left') {
    const card = this.reading(testPoint);
    await card.getByRole('button', { name: /^Record .* reading$/ }).click();
    await expect(card.getByTestId(`recorded-${testPoint}`)).toBeVisible();
  }

  async chooseAnalyser(serial: string) {
    const select = this.page.getByLabel('From the register');
    const value = await select.locator('option', { hasText: serial }).getAttribute('value');
    await select.selectOption(value!);
  }

  async answer(check: string, answer: string) {
    await this.page.getByTestId(`check-${check}`).getByRole('button', { name: answer }).click();
    await expect(this.page.getByTestId(`check-${check}`).getByRole('button', { name: answer })).toHaveAttribute('aria-pressed', 'true');
  }

  verdictBar(): Locator {
    return this.page.getByTestId('verdict-bar');
  }

  syncSummary(): Locator {
    return this.page.getByTestId('sync-summary');
  }
}

async function photoFile(): Promise<Buffer> {
  return sharp({ create: { width: 1600, height: 1200, channels: 3, background: { r: 120, g: 80, b: 60 } } })
    .composite([{ input: Buffer.from('<svg width="1600" height="1200"><rect x="500" y="300" width="600" height="600" fill="#ddd"/></svg>'), top: 0, left: 0 }])
    .jpeg()
    .withExif({ IFD0: { Make: 'FieldPhone' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' } })
    .toBuffer();
}

test('a visit recorded offline survives a reload, syncs when back online, and reaches the office with the same verdicts', async ({ page, context }) => {
  test.setTimeout(240_000);
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
  await expect(page).toHaveURL(/\/field$/);
  await expect(page.getByRole('heading', { name: 'Today' })).toBeVisible();
  const card = page.locator(`a[href="/field/visits/${VISIT}"]`);
  await expect(card).toBeVisible();

  // One online load is enough: the worker takes the page and saves every visit page ahead.
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null && navigator.serviceWorker?.controller !== undefined, undefined, { timeout: 60_000 });
  await expect
    .poll(async () => page.evaluate(async (url) => Boolean(await caches.match(url, { ignoreVary: true, ignoreSearch: true })), `/field/visits/${VISIT}`), { timeout: 60_000 })
    .toBe(true);
  await shot(page, '01-my-visits');

  await card.click();
  await expect(page).toHaveURL(new RegExp(`/field/visits/${VISIT}`));
  await expect(page.getByTestId('visit-screen')).toBeVisible();
  await expect(page.getByTestId('appliance-card')).toHaveCount(3);
  await shot(page, '02-visit-online');

  // In the cellar: no network from here on.
  await context.setOffline(true);
  const visit = new FieldVisit(page);
  await page.getByRole('button', { name: 'I’m on site' }).click();
  await expect(visit.syncSummary()).toContainText('Offline');

  // Appliance 1, the gas fire: within its limits.
  await visit.open(`appliance-${GAS_FIRE}`);
  await expect(page.getByTestId('appliance-screen')).toBeVisible();
  await page.getByRole('button', { name: 'Details are right' }).click();
  await visit.chooseAnalyser('FGA-20871');
  await visit.answer('spillage', 'Passed');
  await visit.typeReading('high_fire', { co: '120', co2: '8.9', o2: '5.2', flue: '180', air: '18' });
  // The figures and the verdict follow the typing. Reference sheet worked example 1: ratio 0.00135
  // (BS 7967 method), air-free CO 160 ppm by the O2 route; clear under the BS 7967 clause 12 gas-fire figure 0.020.
  await expect(page.getByTestId('figures-high_fire')).toContainText('0.0013');
  await expect(page.getByTestId('figures-high_fire')).toContainText('160 ppm');
  await expect(visit.reading('high_fire').locator('[data-verdict]').first()).toHaveAttribute('data-verdict', 'clear');
  await shot(page, '03-gas-fire-typing');
  await visit.record('high_fire');
  await visit.typeReading('low_fire', { co: '12', co2: '5.0', o2: '12.0', flue: '95', air: '18' });
  // A mistyped O2 is named, never shown as NaN, and the entry can still be put right.
  await visit.reading('low_fire').getByLabel('O2 %', { exact: true }).fill('21');
  await expect(visit.reading('low_fire')).toContainText('O2 must be from 0 to below 20.9 %');
  await expect(visit.reading('low_fire')).not.toContainText('NaN');
  await visit.reading('low_fire').getByLabel('O2 %', { exact: true }).fill('12.0');
  await visit.record('low_fire');

  // Appliance 3, the boiler: its spillage test fails, which is danger (uk-reference preset, common trade practice).
  await visit.open(`appliance-${BOILER}`);
  await expect(page.getByTestId('appliance-screen')).toContainText('Utility room');
  await page.getByRole('button', { name: 'Details are right' }).click();
  await visit.chooseAnalyser('FGA-20871');
  await visit.typeReading('high_fire', { co: '180', co2: '8.5', o2: '6.0', flue: '190', air: '18' });
  await visit.record('high_fire');
  await visit.answer('spillage', 'Failed');
  await expect(visit.verdictBar()).toHaveAttribute('data-verdict', 'danger');
  await expect(visit.verdictBar().getByRole('link', { name: 'Make safe' })).toBeVisible();
  await page.getByTestId('photo-file-appliance').setInputFiles({ name: 'terminal.jpg', mimeType: 'image/jpeg', buffer: await photoFile() });
  await expect(page.getByTestId('photos-appliance').getByRole('img')).toHaveCount(1);
  await shot(page, '04-boiler-danger');

  // Appliance 2, the warm-air heater, is capped off: recorded as not tested.
  await visit.open(`appliance-${WARM_AIR}`);
  await page.getByText('Can’t test this appliance?').click();
  await page.getByLabel('Why it was not tested').fill('Capped off at the gas cock; occupant says it has not been used for a year');
  await page.getByLabel('Why it was not tested').blur();

  // Rooms and gas: a room CO check and the tightness test.
  await visit.open('installation');
  await expect(page.getByTestId('installation-screen')).toBeVisible();
  await page.getByLabel('Room', { exact: true }).fill('Living room');
  await page.getByLabel('CO (ppm)').fill('1');
  await page.getByLabel('Over (minutes)').fill('10');
  await page.getByRole('button', { name: 'Record room check' }).click();
  await expect(page.getByTestId('room-check')).toHaveCount(1);
  await page.getByLabel('Start (mbar)').fill('20.5');
  await page.getByLabel('End (mbar)').fill('20.4');
  await page.getByRole('button', { name: 'Record tightness test' }).click();
  await expect(page.getByRole('button', { name: 'Update tightness test' })).toBeVisible();
  await shot(page, '05-rooms-and-gas');

  // Finish: the danger must be made safe before the visit can be submitted.
  await visit.open('finish');
  await expect(page.getByTestId('finish-screen')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Submit visit' })).toBeDisabled();
  await expect(page.getByTestId('blockers')).toContainText('record how it was made safe');
  const makeSafe = page.getByTestId('make-safe-form');
  await makeSafe.getByLabel('Isolated from the supply').check();
  await makeSafe.getByLabel(/has been told of the danger/).check();
  await makeSafe.getByLabel('Agreed').check();
  await makeSafe.getByLabel('Their name').fill('A. Tenant');
  await makeSafe.getByLabel(/warning notice is fixed/).check();
  await shot(page, '06-make-safe');
  await makeSafe.getByRole('button', { name: 'Record make-safe' }).click();
  await expect(page.getByTestId('make-safe-done')).toBeVisible();

  await page.getByLabel('Occupant’s name').fill('A. Tenant');
  const canvas = page.getByTestId('signature-canvas');
  await canvas.scrollIntoViewIfNeeded();
  const box = (await canvas.boundingBox())!;
  await page.mouse.move(box.x + 20, box.y + box.height * 0.6);
  await page.mouse.down();
  for (let i = 1; i <= 12; i++) await page.mouse.move(box.x + 20 + i * 22, box.y + box.height * (0.6 - 0.25 * Math.sin(i / 2)));
  await page.mouse.up();
  await page.getByLabel('I declare this is true').check();
  await page.getByRole('button', { name: 'Save sign-off' }).click();
  await expect(page.getByTestId('signoff-done')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Submit visit' })).toBeEnabled();
  await page.getByRole('button', { name: 'Submit visit' }).click();
  await expect(page.getByTestId('submitted')).toBeVisible();
  await expect(visit.syncSummary()).toContainText(/Offline — \d+ changes saved on this phone/);
  await shot(page, '07-submitted-offline');

  // The phone is reloaded with no network: the page comes from the worker, the work from IndexedDB.
  const pendingBefore = await page.getByTestId('outbox-entry').count();
  await page.reload();
  await expect(page.getByTestId('visit-screen')).toBeVisible({ timeout: 30_000 });
  await expect(page.getByTestId('submitted')).toBeVisible();
  await expect(visit.verdictBar()).toHaveAttribute('data-verdict', 'danger');
  await expect(visit.verdictBar()).toContainText('Made safe');
  expect(await page.getByTestId('outbox-entry').count()).toBe(pendingBefore);
  await expect(page.locator('[data-testid="outbox-entry"][data-status="sent"]')).toHaveCount(0);
  await visit.open(`appliance-${GAS_FIRE}`);
  await expect(visit.reading('high_fire').getByLabel('CO ppm', { exact: true })).toHaveValue('120');
  await expect(visit.reading('low_fire').getByLabel('O2 %', { exact: true })).toHaveValue('12');
  await visit.open(`appliance-${BOILER}`);
  await expect(page.getByTestId('photos-appliance').getByRole('img')).toHaveCount(1);
  await visit.open('finish');
  const fieldVerdicts = Object.fromEntries(await page.getByTestId('summary-appliance').evaluateAll((items) => items.map((li) => [li.getAttribute('data-appliance-id'), li.getAttribute('data-appliance-verdict')])));
  expect(fieldVerdicts).toEqual({ [GAS_FIRE]: 'clear', [WARM_AIR]: 'none', [BOILER]: 'danger' });
  await shot(page, '08-reloaded-offline');

  // Signal again: the outbox drains on its own, nothing left waiting, nothing refused.
  await context.setOffline(false);
  await expect(visit.syncSummary()).toHaveText('All changes sent', { timeout: 60_000 });
  await expect(page.locator('[data-testid="outbox-entry"][data-status="sent"]')).toHaveCount(pendingBefore);
  await page.getByTestId('sync-status').locator('summary').click();
  await shot(page, '09-synced');

  // The office sees the submitted visit, with the verdicts the phone showed.
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in/);
  await signIn.open(`/office/visits/${VISIT}`);
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await expect(page).toHaveURL(new RegExp(`/office/visits/${VISIT}`));
  await expect(page.getByTestId('office-visit-status')).toHaveText('submitted');
  await expect(page.getByTestId('office-overall').locator('[data-verdict]')).toHaveAttribute('data-verdict', 'danger');
  const inspections = page.getByTestId('office-inspection');
  await expect(inspections).toHaveCount(3);
  const officeVerdicts = Object.fromEntries(await inspections.evaluateAll((sections) => sections.map((s) => [s.getAttribute('data-appliance-id'), s.getAttribute('data-verdict-of-record')])));
  expect(officeVerdicts).toEqual(fieldVerdicts);
  // Each reading recorded once: two at the gas fire, one at the boiler.
  await expect(page.getByTestId('office-reading')).toHaveCount(3);
  await expect(page.getByTestId('office-make-safe')).toContainText('Isolated from the supply');
  await expect(page.getByTestId('office-signature')).toBeVisible();
  await expect.poll(async () => page.getByTestId('office-signature').evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true);
  await page.screenshot({ path: 'test-results/screens/field-10-office-view.png', fullPage: true });
});

test('a new version of the field app is offered, and taken only when the engineer says so', async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
  await expect(page).toHaveURL(/\/field$/);
  await page.waitForFunction(() => Boolean(navigator.serviceWorker?.controller), undefined, { timeout: 60_000 });
  const scriptUrl = await page.evaluate(() => navigator.serviceWorker.controller!.scriptURL);
  // A deployment changes the worker file; this build's own file (named after its build directory) stands in for it.
  const file = path.join(process.cwd(), 'public', new URL(scriptUrl).pathname);
  const original = fs.readFileSync(file);
  try {
    fs.appendFileSync(file, `\n// next version ${Date.now()}\n`);
    await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.update());
    const prompt = page.getByTestId('update-prompt');
    await expect(prompt).toContainText('A new version of the field app is ready');
    await shot(page, '11-update-prompt');
    const before = await page.evaluate(() => navigator.serviceWorker.controller?.scriptURL);
    await prompt.getByRole('button', { name: 'Reload' }).click();
    await expect(page.getByRole('heading', { name: 'My visits' })).toBeVisible();
    await expect(prompt).toHaveCount(0);
    expect(await page.evaluate(() => navigator.serviceWorker.controller?.scriptURL)).toBe(before);
    await expect.poll(() => page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting ?? null)).toBeNull();
  } finally {
    fs.writeFileSync(file, original);
  }
});
