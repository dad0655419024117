// Sign-in for the four roles, wrong passwords, throttling, the 403 page, the e-mail link, sign-out.
import { test, expect, ACCOUNTS } from './fixtures';
import { SignInPage, waitForMail } from './pages';

test.describe('staff sign-in', () => {
  test('an engineer lands on My visits, an office user on the office overview', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
    await expect(page).toHaveURL(/\/field$/);
    await expect(page.getByRole('heading', { name: 'My visits' })).toBeVisible();
    await page.screenshot({ path: 'test-results/screens/engineer-home.png', fullPage: true });
    await page.getByRole('button', { name: 'Sign out' }).click();
    await expect(page).toHaveURL(/\/sign-in/);

    await signIn.open();
    await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
    await expect(page).toHaveURL(/\/office$/);
    await page.getByRole('link', { name: 'Sites', exact: true }).first().click();
    await expect(page.getByTestId('sites-page')).toContainText('30 sites');
    await page.screenshot({ path: 'test-results/screens/office-sites.png', fullPage: true });
  });

  test('a wrong password shows an error and the 6th try in 15 minutes is throttled', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    for (let i = 1; i <= 5; i++) {
      await signIn.withPassword(ACCOUNTS.engineer2.email, `wrong-${i}`);
      await expect(signIn.error()).toContainText('do not match');
    }
    // Throttled even with the right password now.
    await signIn.withPassword(ACCOUNTS.engineer2.email, ACCOUNTS.engineer2.password);
    await expect(signIn.error()).toContainText('Too many failed sign-ins');
    await page.screenshot({ path: 'test-results/screens/sign-in-throttled.png', fullPage: true });
  });

  test('an engineer opening an office page gets a 403 page; signed-out users go to sign-in and back', async ({ page }) => {
    const response = await page.goto('/office/sites');
    await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Foffice%2Fsites/);
    expect(response?.status()).toBe(200);
    const signIn = new SignInPage(page);
    await signIn.withPassword(ACCOUNTS.office.email, ACCOUNTS.office.password);
    await expect(page).toHaveURL(/\/office\/sites$/);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await expect(page).toHaveURL(/\/sign-in/);

    await signIn.open();
    await signIn.withPassword(ACCOUNTS.engineer.email, ACCOUNTS.engineer.password);
    await expect(page).toHaveURL(/\/field$/);
    const forbidden = await page.goto('/office');
    expect(forbidden?.status()).toBe(403);
    await expect(page.getByRole('heading', { name: 'This area belongs to another role' })).toBeVisible();
    await page.screenshot({ path: 'test-results/screens/forbidden.png', fullPage: true });
  });
});

test.describe('customer sign-in by e-mail link', () => {
  test('a landlord asks for a link, follows it from the mailbox and lands in the portal', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.askForLink(ACCOUNTS.landlord.email);
    const mail = await waitForMail(ACCOUNTS.landlord.email, 'sign-in link');
    const link = mail.links.find((l) => l.includes('/api/auth/callback/email'));
    expect(link).toBeTruthy();
    await page.goto(link!);
    await expect(page).toHaveURL(/\/portal$/);
    await expect(page.getByRole('heading', { name: 'My properties' })).toBeVisible();
    await expect(page.getByTestId('portal-site').first()).toBeVisible();
    await page.screenshot({ path: 'test-results/screens/landlord-portal.png', fullPage: true });
  });

  test('a homeowner signs in by link and sees only their home', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.askForLink(ACCOUNTS.homeowner.email);
    const mail = await waitForMail(ACCOUNTS.homeowner.email, 'sign-in link');
    await page.goto(mail.links.find((l) => l.includes('/api/auth/callback/email'))!);
    await expect(page.getByRole('heading', { name: 'My home' })).toBeVisible();
    await expect(page.getByTestId('portal-site')).toHaveCount(2);
  });
});
