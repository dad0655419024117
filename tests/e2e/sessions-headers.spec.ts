// Sessions and headers: security headers on every page group, the camera allowed only in the field
// app, expired or forged session tokens refused, deactivation ending access at once.
import fs from 'node:fs';
import path from 'node:path';
import { encode } from 'next-auth/jwt';
import Database from 'better-sqlite3';
import { test, expect, ACCOUNTS } from './fixtures';
import { staffSessionCookie } from '../support/http-session';

const PAGES = ['/', '/sign-in', '/sign-in/check-email', '/field', '/office', '/office/sites', '/portal', '/check/not-a-real-token'];

function secret(): string {
  // The e2e server runs without NEXTAUTH_SECRET, so it uses the generated demo secret file.
  return (JSON.parse(fs.readFileSync(path.resolve(__dirname, '../../.secrets.json'), 'utf8')) as { nextauthSecret: string }).nextauthSecret;
}

test('every page answers with the security headers; the camera only under /field', async ({ request }) => {
  let checked = 0;
  for (const url of PAGES) {
    const res = await request.get(url, { maxRedirects: 0 });
    const h = res.headers();
    expect(h['content-security-policy'], url).toContain("frame-ancestors 'none'");
    expect(h['content-security-policy'], url).toContain("default-src 'self'");
    expect(h['referrer-policy'], url).toBe('strict-origin-when-cross-origin');
    expect(h['x-content-type-options'], url).toBe('nosniff');
    expect(h['x-frame-options'], url).toBe('DENY');
    expect(h['permissions-policy'], url).toContain(url.startsWith('/field') ? 'camera=(self)' : 'camera=()');
    expect(h['x-powered-by'], url).toBeUndefined();
    checked++;
  }
  console.log(`security headers: ${checked} pages checked, ${checked} held`);
});

test('an expired token is refused while a fresh one with the same claims works', async ({ request, baseURL }) => {
  const probe = new Database(path.resolve(__dirname, `../../data/${Number(process.env.E2E_PORT_OFFSET ?? 0) ? `e2e${process.env.E2E_PORT_OFFSET}` : 'e2e'}.db`), { readonly: true });
  const user = probe.prepare('select id, organisation_id, name, email from users where email = ?').get(ACCOUNTS.office.email) as { id: string; organisation_id: string; name: string; email: string };
  probe.close();
  const claims = { uid: user.id, role: 'office' as const, organisationId: user.organisation_id, name: user.name, email: user.email };
  const fresh = await encode({ token: claims, secret: secret(), maxAge: 3600 });
  const expired = await encode({ token: claims, secret: secret(), maxAge: -60 });
  const forged = await encode({ token: claims, secret: 'not-the-secret-not-the-secret-0000', maxAge: 3600 });
  const me = (token: string) => request.get('/api/v1/me', { headers: { cookie: `next-auth.session-token=${token}` } });
  expect((await me(fresh)).status()).toBe(200);
  expect((await me(expired)).status()).toBe(401);
  expect((await me(forged)).status()).toBe(401);
  void baseURL;
});

test('deactivating a user ends their session at once', async ({ request, baseURL }) => {
  const cookie = await staffSessionCookie({ baseUrl: baseURL!, email: ACCOUNTS.engineer2.email, password: ACCOUNTS.engineer2.password }).catch(() => null);
  test.skip(cookie === null, 'engineer2 is throttled by the sign-in test in this run');
  expect((await request.get('/api/v1/me', { headers: { cookie: cookie! } })).status()).toBe(200);
  const file = path.resolve(__dirname, `../../data/${Number(process.env.E2E_PORT_OFFSET ?? 0) ? `e2e${process.env.E2E_PORT_OFFSET}` : 'e2e'}.db`);
  const db = new Database(file);
  try {
    db.prepare('update users set active = 0 where email = ?').run(ACCOUNTS.engineer2.email);
    expect((await request.get('/api/v1/me', { headers: { cookie: cookie! } })).status()).toBe(401);
  } finally {
    db.prepare('update users set active = 1 where email = ?').run(ACCOUNTS.engineer2.email);
    db.close();
  }
});
