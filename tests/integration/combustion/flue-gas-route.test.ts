// POST /api/v1/calculations/flue-gas: figures, sign-in, and 422 naming the field for each kind of bad input.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { noParams, postJson, signInAs } from '../../support/session';
import { closeDb } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { POST } from '@/app/api/v1/calculations/flue-gas/route';

const engineer = DEMO_ACCOUNTS[0];
const landlord = DEMO_ACCOUNTS.find((a) => a.role === 'landlord')!;

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

const call = (body: unknown) => POST(postJson('/api/v1/calculations/flue-gas', body), noParams);

describe('POST /api/v1/calculations/flue-gas', () => {
  it('worked example 1 of the reference sheet (BS 7967 ratio method; air-free CO by O2; 1. BImSchV Siegert)', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    const res = await call({ fuel: 'natural-gas', coPpm: 120, co2Pct: 8.9, o2Pct: 5.2, flueTempC: 180, airTempC: 18 });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.ratio).toBeCloseTo(0.00135, 5);
    expect(body.coAirFreeFromO2Ppm).toBeCloseTo(160, 0);
    expect(body.coAirFreeFromCo2Ppm).toBeCloseTo(158, 0);
    expect(body.co2FromO2Pct).toBeCloseTo(8.79, 2);
    expect(body.lambda).toBeCloseTo(1.331, 3);
    expect(body.flueLossPct).toBeCloseTo(8.23, 2);
    expect(body.warnings).toEqual([]);
  });

  it('null figures count as not measured', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    const body = await (await call({ fuel: 'natural-gas', coPpm: 150, o2Pct: 14, co2Pct: null })).json();
    expect(body.ratio).toBeNull();
    expect(body.coAirFreeFromO2Ppm).toBeCloseTo(454, 0); // worked example 3 (gas oven), reference sheet
  });

  it('401 signed out, 403 for a landlord', async () => {
    signInAs(null);
    expect((await call({ fuel: 'natural-gas', coPpm: 1 })).status).toBe(401);
    signInAs({ id: landlord.id, role: 'landlord', organisationId: demoIds.org });
    expect((await call({ fuel: 'natural-gas', coPpm: 1 })).status).toBe(403);
  });

  it.each([
    [{ fuel: 'wood', coPpm: 10 }, 'fuel'],
    [{ fuel: 'natural-gas' }, 'coPpm'],
    [{ fuel: 'natural-gas', coPpm: '120' }, 'coPpm'],
    [{ fuel: 'natural-gas', coPpm: -5 }, 'coPpm'],
    [{ fuel: 'natural-gas', coPpm: 10, o2Pct: 20.9 }, 'o2Pct'],
    [{ fuel: 'natural-gas', coPpm: 10, o2Pct: -1 }, 'o2Pct'],
    [{ fuel: 'natural-gas', coPpm: 10, co2Pct: 0 }, 'co2Pct'],
    [{ fuel: 'natural-gas', coPpm: 10, co2MaxPct: 0 }, 'co2MaxPct'],
    [{ fuel: 'natural-gas', coPpm: 10, flueTempC: 5000, airTempC: 20, o2Pct: 5 }, 'flueTempC'],
    [{ fuel: 'natural-gas', coPpm: 10, extra: 1 }, '_'],
  ])('422 for %j naming %s', async (body, field) => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    const res = await call(body);
    expect(res.status).toBe(422);
    const json = await res.json();
    expect(json.error.code).toBe('invalid_input');
    expect(Object.keys(json.error.fields)).toContain(field);
  });

  it('400 for a body that is not JSON', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    const res = await POST(new Request('http://localhost:3000/api/v1/calculations/flue-gas', { method: 'POST', body: '{not json' }), noParams);
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe('bad_request');
  });
});
