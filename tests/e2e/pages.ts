// Page objects for the screens the tests drive.
import { expect, type Page } from '@playwright/test';
import { MAIL_API } from './fixtures';

export class SignInPage {
  constructor(private readonly page: Page) {}

  async open(callbackUrl?: string) {
    await this.page.goto(callbackUrl ? `/sign-in?callbackUrl=${encodeURIComponent(callbackUrl)}` : '/sign-in');
    await expect(this.page.getByRole('heading', { name: 'Sign in', level: 1 })).toBeVisible();
  }

  async withPassword(email: string, password: string) {
    await this.page.getByLabel('E-mail', { exact: true }).fill(email);
    await this.page.getByLabel('Password').fill(password);
    await this.page.getByRole('button', { name: 'Sign in' }).click();
  }

  async askForLink(email: string) {
    await this.page.getByLabel('Your e-mail').fill(email);
    await this.page.getByRole('button', { name: 'E-mail me a sign-in link' }).click();
    await expect(this.page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
  }

  error() {
    return this.page.getByRole('alert').first();
  }
}

type MailSummary = { id: string; to: string[]; subject: string };

/** Waits for a message to `to` whose subject contains `subject`, newer than `since` ids. */
export async function waitForMail(to: string, subject: string, timeoutMs = 15_000): Promise<{ id: string; links: string[]; text: string; attachments: Array<{ filename: string }> }> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const list = (await (await fetch(`${MAIL_API}/messages?to=${encodeURIComponent(to)}`)).json()) as MailSummary[];
    const hit = list.find((m) => m.subject.includes(subject));
    if (hit) return (await (await fetch(`${MAIL_API}/messages/${hit.id}`)).json()) as { id: string; links: string[]; text: string; attachments: Array<{ filename: string }> };
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail to ${to} with subject containing "${subject}" within ${timeoutMs} ms`);
}
