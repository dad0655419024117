// GET /api/v1/exports/inspections: CSV rows for a date range, formula-safe cells, office only,
// one organisation's rows only, bad ranges refused.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { freshDatabase } from '../../support/db';
import { get, noParams, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { demoInsightIds } from '@/seeds/07-demo-insight';
import * as exportRoute from '@/app/api/v1/exports/inspections/route';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const day = (offset: number) => new Date(Date.now() + offset * 86400_000).toISOString().slice(0, 10);

beforeAll(async () => {
  await freshDatabase({ seed: true });
  // A hostile location typed into the register must not run as a formula in a spreadsheet.
  await db()('appliances').where({ id: demoInsightIds.risingAppliance }).update({ location: '=HYPERLINK("http://evil.test","Utility")' });
});
afterAll(closeDb);

async function exportCsv(from: string, to: string) {
  const res = await exportRoute.GET(get(`/api/v1/exports/inspections?from=${from}&to=${to}`), noParams);
  return { res, rows: res.status === 200 ? Papa.parse<string[]>((await res.text()).replace(/^\uFEFF/, '').trim(), { newline: '\r\n' }).data : [] };
}

describe('inspections CSV export', () => {
  it('one row per current reading in the range, matching a plain count, with formula cells guarded', async () => {
    signInAs({ id: office.id, role: 'office', organisationId: demoIds.org });
    const { res, rows } = await exportCsv(day(-800), day(0));
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    const [header, ...body] = rows;
    expect(header).toContain('CO/CO2 ratio');
    const from = `${day(-800)}T00:00:00.000Z`;
    const until = `${day(1)}T00:00:00.000Z`;
    const inspections = await db()('inspections as i').join('visits as v', 'v.id', 'i.visit_id').where('i.organisation_id', demoIds.org).andWhere('v.window_start', '>=', from).andWhere('v.window_start', '<', until).select('i.id');
    const inRange = new Set(inspections.map((i) => i.id));
    const readings = (await db()('readings as r').where('r.organisation_id', demoIds.org).whereNotExists(db()('readings as r2').select(db().raw('1')).whereRaw('r2.replaces_id = r.id')).select('r.inspection_id')).filter((r) => inRange.has(r.inspection_id));
    const withReadings = new Set(readings.map((r) => r.inspection_id));
    const expected = readings.length + inspections.filter((i) => !withReadings.has(i.id)).length;
    expect(body.length).toBe(expected);
    const locationCol = header!.indexOf('Location');
    const hostile = body.filter((r) => r[header!.indexOf('Appliance id')] === demoInsightIds.risingAppliance);
    expect(hostile.length).toBeGreaterThan(0);
    expect(hostile.every((r) => r[locationCol]!.startsWith("'="))).toBe(true);
    expect(body.every((r) => !/^[=+\-@\t\r]/.test(r[locationCol]!))).toBe(true);
  });

  it('a narrower range has fewer rows; another organisation sees none of these', async () => {
    signInAs({ id: office.id, role: 'office', organisationId: demoIds.org });
    const all = (await exportCsv(day(-800), day(0))).rows.length;
    const recent = (await exportCsv(day(-100), day(0))).rows.length;
    expect(recent).toBeLessThan(all);
    signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
    expect((await exportCsv(day(-800), day(0))).rows.length).toBe(1); // header only
  });

  it('refuses engineers, reversed and over-long ranges, and bad dates', async () => {
    signInAs({ id: engineer.id, role: 'engineer', organisationId: demoIds.org });
    expect((await exportCsv(day(-10), day(0))).res.status).toBe(403);
    signInAs({ id: office.id, role: 'office', organisationId: demoIds.org });
    expect((await exportCsv(day(0), day(-10))).res.status).toBe(400);
    expect((await exportCsv(day(-2000), day(0))).res.status).toBe(400);
    expect((await exportCsv('2025-13-01', day(0))).res.status).toBe(400);
  });
});
