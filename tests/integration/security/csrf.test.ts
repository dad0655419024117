// Cookie-authenticated writes refuse requests from another site (Origin / Sec-Fetch-Site).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { noParams, signInAs } from '../../support/session';
import { closeDb } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { POST } from '@/app/api/v1/calculations/flue-gas/route';

const body = JSON.stringify({ fuel: 'natural-gas', coPpm: 120, co2Pct: 8.9 });
const request = (headers: Record<string, string>) =>
  new Request('http://localhost:3000/api/v1/calculations/flue-gas', { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body });

beforeAll(async () => {
  await freshDatabase({ seed: true });
  signInAs({ id: DEMO_ACCOUNTS[0].id, role: 'engineer', organisationId: demoIds.org });
});
afterAll(closeDb);

describe('cross-site write refusal', () => {
  it('same origin and no origin (scripts) are accepted', async () => {
    expect((await POST(request({ origin: 'http://localhost:3000' }), noParams)).status).toBe(200);
    expect((await POST(request({}), noParams)).status).toBe(200);
    expect((await POST(request({ 'sec-fetch-site': 'same-origin' }), noParams)).status).toBe(200);
  });

  it.each([
    [{ origin: 'https://evil.example' }],
    [{ origin: 'http://localhost:3000.evil.example' }],
    [{ origin: 'null' }],
    [{ 'sec-fetch-site': 'cross-site' }],
  ])('%j → 403 with the error shape', async (headers) => {
    const res = await POST(request(headers as Record<string, string>), noParams);
    expect(res.status).toBe(403);
    expect((await res.json()).error).toEqual({ code: 'forbidden', message: 'Cross-site request refused.' });
  });
});
