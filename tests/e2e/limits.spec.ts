// Office limits: the jurisdiction tree, a local profile that tightens the boiler ratio, the verdict
// preview naming the deciding rule, validation of a bad rule, and version comparison on the demo tree.
import type { Page } from '@playwright/test';
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage } from './pages';

const SHOTS = 'test-results/screens';

class LimitsPages {
  constructor(private readonly page: Page) {}

  async openTree() {
    await this.page.getByRole('link', { name: 'Limits', exact: true }).first().click();
    await expect(this.page.getByRole('heading', { name: 'Limits', level: 1 })).toBeVisible();
  }

  async preview(readings: { coPpm: string; co2Pct: string }) {
    await this.page.getByLabel('CO (ppm)').fill(readings.coPpm);
    await this.page.getByLabel('CO2 (%)').fill(readings.co2Pct);
    await this.page.getByRole('button', { name: 'Show the verdict' }).click();
    return this.page.getByTestId('preview-result');
  }

  rule() {
    return this.page.getByRole('form', { name: 'Add a rule' });
  }
}

test('an office user tightens the boiler ratio locally and the preview turns from clear to service, naming the local rule', async ({ page }) => {
  const limits = new LimitsPages(page);
  await new SignInPage(page).open();
  await new SignInPage(page).withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await expect(page).toHaveURL(/\/office$/);
  await limits.openTree();
  const tree = page.getByRole('list', { name: 'Jurisdiction tree' });
  await expect(tree).toContainText('Kestrel Bay Borough');
  await page.screenshot({ path: `${SHOTS}/limits-tree.png`, fullPage: true });

  // A new local jurisdiction under the region, with no profile of its own yet.
  const add = page.getByRole('form', { name: 'Add a jurisdiction' });
  await add.getByLabel('Name').fill('Harrowgate Parish');
  await add.getByLabel('Part of').selectOption({ label: '— Westvale Region' });
  await add.getByRole('button', { name: 'Add jurisdiction' }).click();
  await expect(page.getByRole('heading', { name: 'Harrowgate Parish', level: 1 })).toBeVisible();
  const profileUrl = page.url();

  // CO 630 ppm at CO2 9 % is a ratio of 0.007: under the region's 0.008 (BS 7967 clause 12, from memory, via reference sheet).
  await page.getByRole('link', { name: 'Preview a verdict here' }).click();
  await expect(page.getByRole('heading', { name: 'Preview a verdict' })).toBeVisible();
  let result = await limits.preview({ coPpm: '630', co2Pct: '9' });
  await expect(result.locator('[data-verdict]').first()).toHaveAttribute('data-verdict', 'clear');
  await expect(result).toContainText('Westvale Region');
  await page.screenshot({ path: `${SHOTS}/limits-preview-clear.png`, fullPage: true });

  await page.goto(profileUrl);
  await page.getByRole('button', { name: 'Create profile' }).click();
  await expect(page.getByText('No rules yet')).toBeVisible();
  await page.getByRole('button', { name: 'Add a rule' }).click();
  const form = limits.rule();
  await form.getByLabel('Metric').selectOption('co_co2_ratio');
  await form.getByLabel('Appliance category').selectOption('boiler');
  await form.getByLabel('Fuel').selectOption('natural-gas');
  // First a bad rule: danger not above service and no source (checks from lib/limits checkRule).
  await form.getByLabel(/^Service level/).fill('0.006');
  await form.getByLabel(/^Danger level/).fill('0.004');
  await form.getByRole('button', { name: 'Add rule as new version' }).click();
  await expect(form.getByText('Danger level must be above the service level')).toBeVisible();
  await expect(form.getByText('Source is required')).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/limits-rule-errors.png`, fullPage: true });

  await form.getByLabel(/^Danger level/).fill('');
  await form.getByLabel('Source').fill('Configured policy of Harrowgate Parish (invented test figure)');
  await form.getByRole('button', { name: 'Add rule as new version' }).click();
  await expect(page.getByTestId('rule')).toHaveCount(1);
  await expect(page.getByTestId('rule')).toContainText('above 0.006');
  await page.screenshot({ path: `${SHOTS}/limits-profile-editor.png`, fullPage: true });

  await page.getByRole('link', { name: 'Preview a verdict here' }).click();
  result = await limits.preview({ coPpm: '630', co2Pct: '9' });
  await expect(result.locator('[data-verdict]').first()).toHaveAttribute('data-verdict', 'service');
  const decided = page.getByTestId('decided-by');
  await expect(decided).toContainText('Harrowgate Parish');
  await expect(decided).toContainText('Configured policy of Harrowgate Parish');
  await page.screenshot({ path: `${SHOTS}/limits-preview-service.png`, fullPage: true });
});

test('the demo tree: Kestrel Bay overrides the regional boiler ratio, and its two versions compare', async ({ page }) => {
  const limits = new LimitsPages(page);
  await new SignInPage(page).open('/office/limits');
  await new SignInPage(page).withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await page.getByRole('link', { name: /Kestrel Bay Borough/ }).click();
  await expect(page.getByRole('heading', { name: 'Kestrel Bay Borough', level: 1 })).toBeVisible();
  await page.getByRole('button', { name: 'Compare' }).click();
  await expect(page.getByRole('heading', { name: /version 1 → 2/ })).toBeVisible();
  await expect(page.getByRole('list', { name: 'Rule changes' })).toContainText('Service: above 0.007 → above 0.006');
  await page.screenshot({ path: `${SHOTS}/limits-compare.png`, fullPage: true });

  await page.goBack();
  await page.getByRole('link', { name: 'Preview a verdict here' }).click();
  const result = await limits.preview({ coPpm: '630', co2Pct: '9' });
  await expect(result.locator('[data-verdict]').first()).toHaveAttribute('data-verdict', 'service');
  await expect(page.getByTestId('decided-by')).toContainText('Kestrel Bay');
  await expect(page.getByRole('list', { name: 'Each limit checked' })).not.toContainText('Westvale regional code');
});
