// Office operations end to end on a phone: book a visit on the board and see it on the engineer's
// phone; a due-soon reminder reaches the landlord's mailbox; each office screen rendered (and
// checked by axe through the fixtures).
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage, waitForMail } from './pages';

const shot = (name: string) => `test-results/screens/${name}.png`;

test.describe('office operations', () => {
  test('the office books a visit on the board; the engineer sees it on the phone', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
    await expect(page).toHaveURL(/\/office$/);

    await page.goto('/office/board');
    await expect(page.getByRole('heading', { name: 'Scheduling board' })).toBeVisible();
    await expect(page.getByTestId('board-visit').first()).toBeVisible();
    await page.screenshot({ path: shot('office-board-week'), fullPage: true });

    await page.getByRole('link', { name: 'Book a visit' }).click();
    await expect(page.getByRole('heading', { name: 'Book a visit' })).toBeVisible();
    // Validation comes from the same schema as the API.
    await page.getByRole('button', { name: 'Book visit' }).click();
    await expect(page.getByText('Choose a site', { exact: true })).toBeVisible();
    await page.screenshot({ path: shot('office-book-visit-errors'), fullPage: true });

    await page.getByLabel('Site', { exact: true }).selectOption({ label: 'KB-1020 · ' + (await page.getByLabel('Site', { exact: true }).locator('option', { hasText: 'KB-1020' }).textContent())!.split(' · ')[1] });
    await page.getByLabel('Engineer', { exact: true }).selectOption({ label: 'Priya Oduya' });
    await page.getByLabel('Kind of visit').selectOption('breakdown');
    await page.getByLabel('From').fill('18:30');
    await page.getByLabel('To').fill('19:30');
    await page.getByLabel('Notes for the engineer (optional)').fill('Boiler locks out overnight; tenant home after 18:00.');
    await page.getByRole('button', { name: 'Book visit' }).click();
    await expect(page).toHaveURL(/\/office\/board$/);
    const card = page.getByTestId('board-visit').filter({ hasText: 'KB-1020' }).filter({ hasText: '18:30' });
    await expect(card).toBeVisible();
    await page.screenshot({ path: shot('office-board-booked'), fullPage: true });

    // Day view: engineers across.
    await page.getByRole('button', { name: 'Day', exact: true }).click();
    await expect(page.getByRole('region', { name: 'Priya Oduya' }).getByTestId('board-visit').filter({ hasText: 'KB-1020' })).toBeVisible();
    await page.screenshot({ path: shot('office-board-day'), fullPage: true });

    await page.getByRole('button', { name: 'Sign out' }).click();
    await expect(page).toHaveURL(/\/sign-in/);
    await signIn.open();
    await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
    await expect(page).toHaveURL(/\/field$/);
    await expect(page.getByTestId('visit-card').filter({ hasText: 'KB-1020' }).first()).toBeVisible();
    await page.screenshot({ path: shot('engineer-sees-booking'), fullPage: true });
  });

  test('a due-soon reminder arrives in the landlord’s mailbox', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
    await expect(page).toHaveURL(/\/office$/);
    await page.goto('/office/renewals');
    await expect(page.getByRole('heading', { name: 'Renewals', level: 1 })).toBeVisible();
    await expect(page.getByTestId('renewals-row').first()).toBeVisible();
    await expect(page.locator('[data-renewal="overdue"]').first()).toBeVisible();
    await page.getByRole('button', { name: 'Send due reminders now' }).click();
    await expect(page.getByText(/Reminders: \d+ newly due/)).toBeVisible();
    await page.screenshot({ path: shot('office-renewals'), fullPage: true });

    const due = await (await page.request.get('/api/v1/renewals?state=due_soon&pageSize=100')).json();
    const site = due.items.find((i: { recipientEmail: string | null }) => i.recipientEmail);
    expect(site).toBeTruthy();
    const mail = await waitForMail(site.recipientEmail, 'Safety check due soon');
    expect(mail.text).toContain(site.expiresOn);
  });

  test('register, analysers, staff, audit and import screens', async ({ page }, testInfo) => {
    // A retry must not collide with the invitee the first attempt created.
    const inviteeEmail = testInfo.retry === 0 ? 'jonah.wexley@kilnbrook.test' : `jonah.wexley+r${testInfo.retry}@kilnbrook.test`;
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
    await expect(page).toHaveURL(/\/office$/);

    await page.goto('/office/customers');
    // At least the 7 demo customers: other specs in the same run (authorization, hostile strings) add more.
    await expect(page.getByTestId('customers-page')).toContainText(/\d+ customers/);
    const customers = Number((await page.getByTestId('customers-page').textContent())?.match(/(\d+) customers/)?.[1] ?? 0);
    expect(customers).toBeGreaterThanOrEqual(7);
    await page.screenshot({ path: shot('office-customers'), fullPage: true });

    await page.goto('/office/sites');
    await page.getByRole('link', { name: 'KB-1006' }).click();
    await expect(page.getByRole('heading', { name: /KB-1006/ })).toBeVisible();
    await expect(page.getByRole('heading', { name: /No-access attempts/ })).toBeVisible();
    await page.screenshot({ path: shot('office-site-detail'), fullPage: true });

    await page.goto('/office/sites/import');
    await page.getByLabel('CSV file').setInputFiles({ name: 'sites.csv', mimeType: 'text/csv', buffer: Buffer.from('reference,address_line1,town,postcode,jurisdiction,landlord_email\nNEW-1,,Kestrel Bay,KB1 1AA,Atlantis,dev.anand@harbourline.test\n') });
    await page.getByRole('button', { name: 'Check file' }).click();
    await expect(page.getByTestId('import-errors')).toContainText('jurisdiction');
    await page.screenshot({ path: shot('office-import-preview'), fullPage: true });

    await page.goto('/office/analysers');
    await expect(page.locator('[data-calibration="overdue"]').first()).toBeVisible();
    await page.screenshot({ path: shot('office-analysers'), fullPage: true });

    await page.goto('/office/users');
    await page.getByLabel('Name', { exact: true }).fill('Jonah Wexley');
    await page.getByLabel('E-mail', { exact: true }).fill(inviteeEmail);
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await expect(page.getByText(`Invitation sent to ${inviteeEmail}.`)).toBeVisible();
    await page.screenshot({ path: shot('office-users'), fullPage: true });
    const invite = await waitForMail(inviteeEmail, 'set your password');
    await page.goto('/office/audit');
    await expect(page.getByTestId('audit-row').filter({ hasText: 'Jonah Wexley' }).first()).toBeVisible();
    await page.screenshot({ path: shot('office-audit'), fullPage: true });

    await page.getByRole('button', { name: 'Sign out' }).click();
    // Let the sign-out navigation finish, or the next goto is aborted by it.
    await expect(page).toHaveURL(/\/sign-in/);
    await page.goto(invite.links.find((l) => l.includes('/set-password'))!);
    await page.getByLabel('New password').fill('a-long-new-password');
    await page.getByLabel('Same password again').fill('a-long-new-password');
    await page.getByRole('button', { name: 'Set password' }).click();
    await expect(page.getByText('Password set')).toBeVisible();
    await page.screenshot({ path: shot('set-password-done'), fullPage: true });
    await signIn.open();
    await signIn.withPassword(inviteeEmail, 'a-long-new-password');
    await expect(page).toHaveURL(/\/field$/);
  });
});
