// Shared fixtures: every page a test visits is checked with axe for serious and critical
// accessibility violations, so new pages inherit the check; plus sign-in helpers.
import { test as base, expect, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';

type AxeFinding = { url: string; id: string; impact: string; help: string; targets: string[] };

async function axeCheck(page: Page, seen: Set<string>, findings: AxeFinding[]) {
  const url = page.url();
  const key = url.replace(/[?#].*$/, '');
  if (seen.has(key) || !/^https?:/.test(url)) return;
  try {
    await page.waitForLoadState('load');
    const first = await new AxeBuilder({ page }).analyze();
    const serious = (r: typeof first) => r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    let result = first;
    if (serious(first).length > 0) {
      // A page caught mid-hydration or mid-navigation can show a passing state (e.g. an attribute
      // on <html>); look again once it settles and report what is still there.
      await page.waitForLoadState('networkidle').catch(() => undefined);
      result = await new AxeBuilder({ page }).analyze();
    }
    seen.add(key);
    for (const v of result.violations) {
      if (v.impact === 'serious' || v.impact === 'critical') {
        findings.push({ url, id: v.id, impact: v.impact, help: v.help, targets: v.nodes.map((n) => n.target.join(' ')).slice(0, 5) });
      }
    }
  } catch {
    // The page moved on while axe ran; it is checked when the test settles on it.
  }
}

export const test = base.extend<{ axe: void }>({
  axe: [
    async ({ page }, use) => {
      const seen = new Set<string>();
      const findings: AxeFinding[] = [];
      const pending: Promise<void>[] = [];
      page.on('load', () => {
        pending.push(axeCheck(page, seen, findings));
      });
      await use();
      await Promise.allSettled(pending);
      if (!page.isClosed()) await axeCheck(page, seen, findings);
      expect(findings, `accessibility violations:\n${JSON.stringify(findings, null, 2)}`).toEqual([]);
    },
    { auto: true },
  ],
});

export { expect };

export const ACCOUNTS = {
  engineer: { email: 'priya.oduya@kilnbrook.test', password: 'ember-field-1' },
  engineer2: { email: 'tomasz.reilly@kilnbrook.test', password: 'ember-field-2' },
  office: { email: 'margo.felling@kilnbrook.test', password: 'ember-office-1' },
  landlord: { email: 'dev.anand@harbourline.test' },
  homeowner: { email: 'hal.brennick@homes.test' },
};

export const MAIL_API = `http://127.0.0.1:${2626 + Number(process.env.E2E_PORT_OFFSET ?? 0)}`;
export const PAYMENT_API = `http://127.0.0.1:${12211 + Number(process.env.E2E_PORT_OFFSET ?? 0)}`;
