// Insight: the office dashboard's figures open the lists behind them; the demo boiler whose ratio
// keeps rising shows "Getting worse" on the office appliance-history page and through the history
// API; the room CO exposure estimate. The engineer's visit screen, online and offline, is checked in
// field-insight.spec.ts.
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage } from './pages';

const RISING_APPLIANCE = '00000005-0001-4000-8000-0000000003e8';

test('the office opens the dashboard, follows the overdue count and lands on the matching list', async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open('/office/dashboard');
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await expect(page.getByRole('heading', { name: 'Dashboard', level: 1 })).toBeVisible();
  const overdue = page.getByTestId('figure-overdue');
  const count = Number((await overdue.locator('span').first().innerText()).trim());
  expect(count).toBeGreaterThan(0);
  await page.screenshot({ path: 'test-results/screens/insight-dashboard.png', fullPage: true });
  await overdue.click();
  await expect(page).toHaveURL(/\/office\/dashboard\/overdue$/);
  await expect(page.getByRole('heading', { name: 'Overdue certificates' })).toBeVisible();
  await expect(page.getByTestId('list-count')).toContainText(`${count} item`);
  await expect(page.getByTestId('overdue-list').getByRole('listitem')).toHaveCount(count);
  await page.screenshot({ path: 'test-results/screens/insight-overdue.png', fullPage: true });

  await page.goto('/office/dashboard');
  await page.getByTestId('figure-danger').click();
  await expect(page.getByRole('heading', { name: 'Open danger findings' })).toBeVisible();
  await expect(page.getByText('Room CO reached 38 ppm')).toBeVisible();
});

test('the rising boiler shows "Getting worse" with its charts; the room check shows an estimate', async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open(`/office/insight/appliances/${RISING_APPLIANCE}`);
  await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
  await expect(page.getByTestId('appliance-history-page')).toBeVisible();
  await expect(page.getByTestId('getting-worse-flag')).toContainText('Getting worse');
  await expect(page.getByTestId('getting-worse-flag')).toContainText('rose at each of the last 3 inspections');
  await expect(page.getByTestId('diagnostic-hints')).toContainText('Ratio rising over time');
  await expect(page.locator('.recharts-surface').first()).toBeVisible();
  await page.screenshot({ path: 'test-results/screens/insight-appliance-history.png', fullPage: true });

  await page.goto('/office/dashboard');
  await page.getByRole('link', { name: /38 ppm in the bathroom/ }).click();
  await expect(page.getByTestId('exposure-panel')).toContainText('Estimate — not a diagnosis');
  await expect(page.getByRole('alert').filter({ hasText: 'Room CO is high' })).toBeVisible();
  const restingAfter8h = await page.getByTestId('cohb-estimate').last().innerText();
  await page.getByLabel('Adult doing light work').check();
  await expect(page.getByTestId('cohb-estimate').last()).not.toHaveText(restingAfter8h);
  await page.screenshot({ path: 'test-results/screens/insight-exposure.png', fullPage: true });
});

test('an engineer gets the flag in the history payload the visit screen caches', async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open();
  // Priya, not Tomasz: auth.spec throttles Tomasz's account on purpose earlier in the same run.
  await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
  await expect(page).toHaveURL(/\/field$/);
  const res = await page.request.get(`/api/v1/insight/appliances/${RISING_APPLIANCE}/history`);
  expect(res.status()).toBe(200);
  const body = (await res.json()) as { history: { trend: { worsening: boolean; reasons: string[] } } };
  expect(body.history.trend.worsening).toBe(true);
  expect(body.history.trend.reasons).toContain('rising');
});
