// Authorization against the running app with real cookies: every page group × role (signed out →
// sign-in with the way back, wrong role → the 403 page), cross-organisation and cross-customer pages
// and API reads → 404, writes refused. Staff sign in with passwords, customers by the e-mail link.
// Then hostile strings stored through the API are rendered by the pages: always escaped, no dialog.
import path from 'node:path';
import Database from 'better-sqlite3';
import type { APIRequestContext, Browser } from '@playwright/test';
import { test, expect, ACCOUNTS, MAIL_API } from './fixtures';
import { SignInPage } from './pages';
import { staffSessionCookie } from '../support/http-session';

type Role = 'anonymous' | 'engineer' | 'office' | 'landlord' | 'homeowner' | 'otherOffice' | 'otherLandlord';
const OTHER_OFFICE = { email: 'office@dunmere.test', password: 'other-office-1' };
const OTHER_LANDLORD = 'landlord@dunmere.test';
const offset = Number(process.env.E2E_PORT_OFFSET ?? 0);
const dbFile = path.resolve(__dirname, `../../data/${offset ? `e2e${offset}` : 'e2e'}.db`);

function lookup<T>(sql: string, ...args: unknown[]): T {
  const probe = new Database(dbFile, { readonly: true });
  try {
    return probe.prepare(sql).get(...args) as T;
  } finally {
    probe.close();
  }
}

/** Signs a customer in by the e-mail link (as a person would) and returns the session cookie. */
async function customerCookie(browser: Browser, email: string): Promise<string> {
  const before = new Set(((await (await fetch(`${MAIL_API}/messages?to=${encodeURIComponent(email)}`)).json()) as Array<{ id: string }>).map((m) => m.id));
  const context = await browser.newContext();
  const page = await context.newPage();
  try {
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.askForLink(email);
    let link: string | undefined;
    for (let i = 0; i < 60 && !link; i++) {
      const list = (await (await fetch(`${MAIL_API}/messages?to=${encodeURIComponent(email)}`)).json()) as Array<{ id: string; subject: string }>;
      const fresh = list.find((m) => !before.has(m.id) && m.subject.includes('sign-in link'));
      if (fresh) link = ((await (await fetch(`${MAIL_API}/messages/${fresh.id}`)).json()) as { links: string[] }).links.find((l) => l.includes('/api/auth/callback/email'));
      else await new Promise((r) => setTimeout(r, 250));
    }
    if (!link) throw new Error(`no sign-in link reached ${email}`);
    await page.goto(link);
    await expect(page).toHaveURL(/\/portal/);
    const session = (await context.cookies()).find((c) => c.name.endsWith('next-auth.session-token'));
    if (!session) throw new Error(`no session cookie for ${email}`);
    return `${session.name}=${session.value}`;
  } finally {
    await context.close();
  }
}

const cookies: Partial<Record<Role, string>> = { anonymous: '' };

test.describe.configure({ mode: 'serial' });

test.beforeAll(async ({ browser, baseURL }) => {
  const base = baseURL!;
  cookies.engineer = await staffSessionCookie({ baseUrl: base, email: ACCOUNTS.engineer.email, password: ACCOUNTS.engineer.password });
  cookies.office = await staffSessionCookie({ baseUrl: base, email: ACCOUNTS.office.email, password: ACCOUNTS.office.password });
  cookies.otherOffice = await staffSessionCookie({ baseUrl: base, email: OTHER_OFFICE.email, password: OTHER_OFFICE.password });
  cookies.landlord = await customerCookie(browser, ACCOUNTS.landlord.email);
  cookies.homeowner = await customerCookie(browser, ACCOUNTS.homeowner.email);
  cookies.otherLandlord = await customerCookie(browser, OTHER_LANDLORD);
});

const tally = { tried: 0, held: 0 };
test.afterAll(() => console.log(`authorization matrix (e2e): tried ${tally.tried}, held ${tally.held}`));

async function check(request: APIRequestContext, input: { who: Role; method?: 'GET' | 'POST' | 'PATCH'; url: string; expect: number | RegExp; body?: unknown }) {
  tally.tried += 1;
  const headers: Record<string, string> = cookies[input.who] ? { cookie: cookies[input.who]! } : {};
  const res = await request.fetch(input.url, { method: input.method ?? 'GET', headers, maxRedirects: 0, data: input.body });
  const status = res.status();
  const label = `${input.method ?? 'GET'} ${input.url} as ${input.who}`;
  if (typeof input.expect === 'number') expect(status, label).toBe(input.expect);
  else {
    // A redirect to sign-in that brings the person back afterwards.
    expect([302, 303, 307, 308], label).toContain(status);
    expect(res.headers()['location'] ?? '', label).toMatch(input.expect);
  }
  if (status >= 400 && input.url.startsWith('/api/')) expect((await res.json()).error, label).toMatchObject({ code: expect.any(String), message: expect.any(String) });
  tally.held += 1;
  return res;
}

const GROUPS: Array<{ url: string; allowed: Role[] }> = [
  { url: '/field', allowed: ['engineer'] },
  { url: '/office', allowed: ['office'] },
  { url: '/office/sites', allowed: ['office'] },
  { url: '/office/invoices', allowed: ['office'] },
  { url: '/office/review', allowed: ['office'] },
  { url: '/portal', allowed: ['landlord', 'homeowner'] },
  { url: '/portal/invoices', allowed: ['landlord', 'homeowner'] },
];

test('page groups × roles: sign-in for the signed out, the 403 page for the wrong role', async ({ request }) => {
  for (const group of GROUPS) {
    for (const who of ['anonymous', 'engineer', 'office', 'landlord', 'homeowner'] as const) {
      if (who === 'anonymous') {
        await check(request, { who, url: group.url, expect: new RegExp(`/sign-in\\?callbackUrl=${encodeURIComponent(group.url).replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}`) });
        continue;
      }
      const res = await check(request, { who, url: group.url, expect: group.allowed.includes(who) ? 200 : 403 });
      if (!group.allowed.includes(who)) expect(await res.text()).toContain('Not for your account');
    }
  }
  // The certificate check page is public by its token; an unknown token is a 404 page for everyone.
  for (const who of ['anonymous', 'engineer', 'office', 'landlord', 'homeowner'] as const) await check(request, { who, url: '/check/not-a-real-token-000000000000', expect: 404 });
});

test("other organisations' and other customers' pages and API reads answer 404; writes are refused", async ({ request }) => {
  const site = lookup<{ id: string }>("select s.id from sites s join users u on u.id = s.landlord_id where u.email = ? order by s.id limit 1", ACCOUNTS.landlord.email).id;
  const halSite = lookup<{ id: string }>("select s.id from sites s join users u on u.id = s.homeowner_id where u.email = ? order by s.id limit 1", ACCOUNTS.homeowner.email).id;
  const invoice = lookup<{ id: string }>("select i.id from invoices i join users u on u.id = i.payer_id where u.email = ? and i.sent_at is not null order by i.id limit 1", ACCOUNTS.landlord.email).id;
  const visit = lookup<{ id: string }>("select v.id from visits v join users u on u.id = v.engineer_id where u.email = ? order by v.window_start desc limit 1", ACCOUNTS.engineer2.email).id;
  const customer = lookup<{ id: string }>('select id from users where email = ?', ACCOUNTS.landlord.email).id;

  // Pages
  await check(request, { who: 'office', url: `/office/sites/${site}`, expect: 200 });
  await check(request, { who: 'otherOffice', url: `/office/sites/${site}`, expect: 404 });
  await check(request, { who: 'otherOffice', url: `/office/customers/${customer}`, expect: 404 });
  // The list pages' loading screens live in a (list) route group, so detail pages do not stream and
  // notFound() still sets the status line; another organisation's invoice also reads exactly like a missing one.
  await check(request, { who: 'office', url: `/office/invoices/${invoice}`, expect: 200 });
  await check(request, { who: 'otherOffice', url: `/office/invoices/${invoice}`, expect: 404 });
  await sameAsMissing(request, { who: 'otherOffice', url: `/office/invoices/${invoice}`, missing: '/office/invoices/00000000-0000-4000-8000-000000000000' });
  await check(request, { who: 'office', url: `/office/board/visits/${visit}`, expect: 200 });
  await check(request, { who: 'otherOffice', url: `/office/board/visits/${visit}`, expect: 404 });
  await check(request, { who: 'otherOffice', url: `/office/review/${visit}`, expect: 404 });
  await check(request, { who: 'landlord', url: `/portal/sites/${site}`, expect: 200 });
  await check(request, { who: 'homeowner', url: `/portal/sites/${site}`, expect: 404 });
  await check(request, { who: 'landlord', url: `/portal/sites/${halSite}`, expect: (await isShared(halSite, ACCOUNTS.landlord.email)) ? 200 : 404 });
  await check(request, { who: 'otherLandlord', url: `/portal/sites/${site}`, expect: 404 });
  await check(request, { who: 'landlord', url: `/portal/invoices/${invoice}`, expect: 200 });
  await check(request, { who: 'homeowner', url: `/portal/invoices/${invoice}`, expect: 404 });
  await check(request, { who: 'otherLandlord', url: `/portal/invoices/${invoice}`, expect: 404 });

  // API reads with real cookies
  await check(request, { who: 'landlord', url: `/api/v1/sites/${site}`, expect: 200 });
  await check(request, { who: 'homeowner', url: `/api/v1/sites/${site}`, expect: 404 });
  await check(request, { who: 'otherLandlord', url: `/api/v1/portal/sites/${site}`, expect: 404 });
  await check(request, { who: 'otherOffice', url: `/api/v1/sites/${site}`, expect: 404 });
  await check(request, { who: 'otherOffice', url: `/api/v1/customers/${customer}`, expect: 404 });
  await check(request, { who: 'landlord', url: `/api/v1/invoices/${invoice}`, expect: 200 });
  await check(request, { who: 'homeowner', url: `/api/v1/invoices/${invoice}`, expect: 404 });
  await check(request, { who: 'otherOffice', url: `/api/v1/invoices/${invoice}`, expect: 404 });
  await check(request, { who: 'engineer', url: `/api/v1/field/visits/${visit}`, expect: 404 });
  await check(request, { who: 'landlord', url: '/api/v1/customers', expect: 403 });
  await check(request, { who: 'engineer', url: '/api/v1/invoices', expect: 403 });
  await check(request, { who: 'anonymous', url: '/api/v1/me', expect: 401 });
  const otherList = await check(request, { who: 'otherOffice', url: '/api/v1/sites?pageSize=100', expect: 200 });
  expect(await otherList.text()).not.toContain(site);

  // Writes
  await check(request, { who: 'otherOffice', method: 'PATCH', url: `/api/v1/customers/${customer}`, body: { role: 'landlord', name: 'Taken over', email: ACCOUNTS.landlord.email }, expect: 404 });
  await check(request, { who: 'otherOffice', method: 'POST', url: `/api/v1/invoices/${invoice}/void`, body: { reason: 'Not ours to void' }, expect: 404 });
  await check(request, { who: 'homeowner', method: 'POST', url: '/api/v1/portal/renewal-requests', body: { siteId: site }, expect: 404 });
  await check(request, { who: 'landlord', method: 'POST', url: `/api/v1/invoices/${invoice}/refund`, body: { amountMinor: 100 }, expect: 403 });
  await check(request, { who: 'anonymous', method: 'POST', url: '/api/v1/sites', body: {}, expect: 401 });
});

async function sameAsMissing(request: APIRequestContext, input: { who: Role; url: string; missing: string }) {
  tally.tried += 1;
  const headers = { cookie: cookies[input.who]! };
  const [theirs, none] = await Promise.all([request.get(input.url, { headers, maxRedirects: 0 }), request.get(input.missing, { headers, maxRedirects: 0 })]);
  expect(theirs.status(), input.url).toBe(none.status());
  const body = await theirs.text();
  expect(body, input.url).toContain('Nothing here');
  expect(body, input.url).not.toMatch(/Invoice [A-Z]+-?\d/);
  tally.held += 1;
}

async function isShared(siteId: string, landlordEmail: string): Promise<boolean> {
  return Boolean(lookup<{ id: string } | undefined>('select s.id from sites s join users u on u.id = s.landlord_id where s.id = ? and u.email = ?', siteId, landlordEmail));
}

const XSS = ['<script>alert("xss-1")</script>', '<img src=x onerror=alert("xss-2")>', '"><svg onload=alert("xss-3")>'];

test('hostile strings stored through the API are escaped on every page that shows them', async ({ browser, request }) => {
  const office = { cookie: cookies.office!, origin: new URL(test.info().project.use.baseURL!).origin };
  const post = async (method: 'POST' | 'PATCH', url: string, data: unknown) => {
    const res = await request.fetch(url, { method, headers: office, data });
    expect(res.status(), `${method} ${url}: ${await res.text()}`).toBeLessThan(300);
    return res.json();
  };
  const stamp = Date.now();
  const email = `xss.${stamp}@example.test`;
  const customer = (await post('POST', '/api/v1/customers', { role: 'landlord', name: `${XSS[1]} Landlord`, email, phone: XSS[2] })) as { customer: { id: string } };
  const jurisdiction = lookup<{ id: string }>("select j.id from jurisdictions j join users u on u.organisation_id = j.organisation_id where u.email = ? order by j.id limit 1", ACCOUNTS.office.email).id;
  const site = (await post('POST', '/api/v1/sites', {
    reference: `X${stamp % 100000}`,
    addressLine1: `${XSS[0]} Road`,
    town: XSS[2],
    postcode: 'XS1 1SS',
    jurisdictionId: jurisdiction,
    landlordId: customer.customer.id,
    tenantName: XSS[1],
    accessNotes: `Key under the mat ${XSS[0]} ${XSS[1]}`,
  })) as { site: { id: string } };
  await post('POST', '/api/v1/appliances', { siteId: site.site.id, category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: XSS[1], make: XSS[0] });
  const date = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
  await post('POST', '/api/v1/visits', { siteId: site.site.id, kind: 'service', date, startTime: '08:00', endTime: '08:30', notes: XSS[0] });

  // shows: the page certainly renders one of the strings (detail pages); lists may page it away.
  const pages: Array<{ who: 'office' | 'customer'; url: string; shows: boolean }> = [
    { who: 'office', url: '/office/customers', shows: false },
    { who: 'office', url: `/office/customers/${customer.customer.id}`, shows: true },
    { who: 'office', url: '/office/sites', shows: false },
    { who: 'office', url: `/office/sites/${site.site.id}`, shows: true },
    { who: 'office', url: `/office/board?from=${date}`, shows: false },
    { who: 'customer', url: '/portal', shows: true },
    { who: 'customer', url: `/portal/sites/${site.site.id}`, shows: true },
  ];
  const customerCookieValue = await customerCookie(browser, email);
  const base = test.info().project.use.baseURL!;
  for (const entry of pages) {
    tally.tried += 1;
    const context = await browser.newContext();
    const cookie = entry.who === 'office' ? office.cookie : customerCookieValue;
    const [name, ...value] = cookie.split('=');
    await context.addCookies([{ name, value: value.join('='), url: base }]);
    const page = await context.newPage();
    const dialogs: string[] = [];
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    const res = await page.goto(entry.url);
    expect(res?.status(), entry.url).toBe(200);
    await page.waitForLoadState('networkidle').catch(() => undefined);
    const html = await page.content();
    const raw = await res!.text();
    for (const s of XSS) {
      expect(html, `${entry.url} renders ${s} as markup`).not.toContain(s);
      expect(raw, `${entry.url} sends ${s} unescaped`).not.toContain(s);
    }
    // The hostile text is really on the page, shown as text.
    if (entry.shows) expect(await page.locator('body').innerText(), entry.url).toMatch(/<script>|<img src=x|<svg onload/);
    expect(await page.locator('script:not([src])').evaluateAll((els) => els.filter((e) => /alert\("xss-/.test(e.textContent ?? '') && !/self\.__next_f/.test(e.textContent ?? '')).length), entry.url).toBe(0);
    expect(dialogs, entry.url).toEqual([]);
    tally.held += 1;
    await context.close();
  }
});
