// CSV import (preview reports each bad row and column and writes nothing; commit is all or nothing)
// and export (every list; formula-injection cells neutralised, per OWASP's CSV injection advice).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { freshDatabase } from '../../support/db';
import { get, noParams, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import * as siteImport from '@/app/api/v1/sites/import/route';
import * as applianceImport from '@/app/api/v1/appliances/import/route';
import * as siteExport from '@/app/api/v1/sites/export/route';
import * as applianceExport from '@/app/api/v1/appliances/export/route';
import * as customerExport from '@/app/api/v1/customers/export/route';
import * as analyserExport from '@/app/api/v1/analysers/export/route';
import * as userExport from '@/app/api/v1/users/export/route';
import * as auditExport from '@/app/api/v1/audit/export/route';
import * as renewalExport from '@/app/api/v1/renewals/export/route';
import { safeCell, toCsv } from '@/lib/csv';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const landlord = DEMO_ACCOUNTS.find((a) => a.role === 'landlord' && a.org !== 'other')!;
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org, name: office.name });
const csvPost = (url: string, body: string) => new Request(new URL(url, 'http://localhost:3000'), { method: 'POST', headers: { 'content-type': 'text/csv' }, body });
const parse = (text: string) => Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data;

const HEADER = 'reference,address_line1,address_line2,town,postcode,jurisdiction,landlord_email,homeowner_email,tenant_name,tenant_email,tenant_phone,access_notes';

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('site import', () => {
  it('a file with bad rows reports each by row and column and writes nothing', async () => {
    asOffice();
    const before = await db()('sites').count({ n: '*' });
    const csv = [
      HEADER,
      `IM-1,1 Good Street,,Kestrel Bay,KB1 1AA,Kestrel Bay Borough,${landlord.email},,,,,`, // row 2: fine
      `IM-2,,,Kestrel Bay,KB1 1AB,Kestrel Bay Borough,${landlord.email},,,,,`, // row 3: no address
      `IM-3,3 Good Street,,Kestrel Bay,KB1 1AC,Atlantis,${landlord.email},,,,,`, // row 4: unknown jurisdiction
      `IM-4,4 Good Street,,Kestrel Bay,KB1 1AD,Kestrel Bay Borough,nobody@nowhere.test,,,not-an-email,,`, // row 5: unknown landlord, bad tenant e-mail
      `KB-1001,5 Good Street,,Kestrel Bay,KB1 1AE,Kestrel Bay Borough,${landlord.email},,,,,`, // row 6: reference taken
      `IM-1,6 Good Street,,Kestrel Bay,KB1 1AF,Kestrel Bay Borough,${landlord.email},,,,,`, // row 7: repeats row 2
    ].join('\n');
    for (const mode of ['preview', 'commit']) {
      const res = await siteImport.POST(csvPost(`/api/v1/sites/import?mode=${mode}`, csv), noParams);
      const body = await res.json();
      expect(res.status).toBe(mode === 'preview' ? 200 : 422);
      const found = body.errors.map((e: { row: number; column: string }) => `${e.row}:${e.column}`).sort();
      expect(found).toEqual(['3:address_line1', '4:jurisdiction', '5:landlord_email', '5:tenant_email', '6:reference', '7:reference'].sort());
    }
    expect(await db()('sites').count({ n: '*' })).toEqual(before);
    expect(await db()('sites').where({ reference: 'IM-1' }).first()).toBeUndefined();
  });

  it('a good file writes everything, audited as an import', async () => {
    asOffice();
    const csv = [
      HEADER,
      `GD-1,10 Ember Street,Flat 2,Kestrel Bay,kb2 2aa,Kestrel Bay Borough,${landlord.email},,P. Lark,lark@tenants.test,07700 900999,Key with porter`,
      'GD-2,"12 Ember Street, rear",,Ashby Vale,AV1 1AA,Westvale Region,,hal.brennick@homes.test,,,,"Ring twice; ""back door"""',
    ].join('\r\n');
    const preview = await (await siteImport.POST(csvPost('/api/v1/sites/import', csv), noParams)).json();
    expect(preview).toMatchObject({ total: 2, valid: 2, errors: [] });
    expect(await db()('sites').where({ reference: 'GD-1' }).first()).toBeUndefined();
    const res = await siteImport.POST(csvPost('/api/v1/sites/import?mode=commit', csv), noParams);
    expect(res.status).toBe(201);
    expect((await res.json()).created).toBe(2);
    const gd2 = await db()('sites').where({ reference: 'GD-2' }).first();
    expect(gd2).toMatchObject({ address_line1: '12 Ember Street, rear', access_notes: 'Ring twice; "back door"', homeowner_id: DEMO_ACCOUNTS.find((a) => a.email === 'hal.brennick@homes.test')!.id });
    expect((await db()('sites').where({ reference: 'GD-1' }).first()).postcode).toBe('KB2 2AA');
    expect(await db()('audit_log').where({ entity_id: gd2.id, action: 'import' }).first()).toBeDefined();
  });

  it('a wrong header is reported before any row', async () => {
    asOffice();
    const body = await (await siteImport.POST(csvPost('/api/v1/sites/import', 'ref,street\nA,B'), noParams)).json();
    expect(body.errors.every((e: { row: number }) => e.row === 1)).toBe(true);
    expect(body.errors.map((e: { column: string }) => e.column)).toEqual(expect.arrayContaining(['reference', 'ref']));
  });
});

describe('appliance import', () => {
  it('bad rows by row and column, then a good file', async () => {
    asOffice();
    const header = 'site_reference,category,fuel,flue_type,location,make,model,serial,rated_input_kw,mfr_ratio_max,mfr_co_air_free_max_ppm,mfr_co_max_ppm';
    const bad = [header, 'KB-1003,boiler,natural-gas,open_flue,Kitchen,,,,24,,,', 'NOPE-1,boiler,natural-gas,open_flue,Kitchen,,,,,,,', 'KB-1003,toaster,coal,open_flue,,,,,-3,,,'].join('\n');
    const before = await db()('appliances').count({ n: '*' });
    const res = await applianceImport.POST(csvPost('/api/v1/appliances/import?mode=commit', bad), noParams);
    expect(res.status).toBe(422);
    const found = (await res.json()).errors.map((e: { row: number; column: string }) => `${e.row}:${e.column}`).sort();
    expect(found).toEqual(['3:site_reference', '4:category', '4:fuel', '4:location', '4:rated_input_kw'].sort());
    expect(await db()('appliances').count({ n: '*' })).toEqual(before);
    const good = [header, 'KB-1003,water_heater,propane,room_sealed,Bathroom,Tidewell,Flow 11,TW-1,20,,,'].join('\n');
    expect((await applianceImport.POST(csvPost('/api/v1/appliances/import?mode=commit', good), noParams)).status).toBe(201);
    expect(await db()('appliances').where({ serial: 'TW-1', site_id: demoIds.site(2) }).first()).toBeDefined();
  });
});

describe('export', () => {
  it('neutralises cells that a spreadsheet would run as formulas', () => {
    for (const evil of ['=HYPERLINK("http://x.test","click")', '+1+1', '-2+3', '@SUM(A1)', '\t=1']) expect(safeCell(evil).startsWith("'")).toBe(true);
    expect(safeCell('12 Ferrow Lane')).toBe('12 Ferrow Lane');
    expect(toCsv([{ header: 'a', value: (r: { a: string }) => r.a }], [{ a: '=1+2' }, { a: 'x,"y"' }])).toBe('\uFEFFa\r\n\'=1+2\r\n"x,""y"""\r\n');
  });

  it('an imported formula-injection cell is exported safely', async () => {
    asOffice();
    const csv = [HEADER, `FX-1,=HYPERLINK("http://evil.test"),,Kestrel Bay,KB1 9ZZ,Kestrel Bay Borough,${landlord.email},@cmd,,,,`].join('\n');
    // A homeowner e-mail of "@cmd" is refused; the address cell is text and may be stored.
    const preview = await (await siteImport.POST(csvPost('/api/v1/sites/import', csv), noParams)).json();
    expect(preview.errors.map((e: { column: string }) => e.column)).toEqual(['homeowner_email']);
    const fixed = csv.replace(',@cmd,', ',,');
    expect((await siteImport.POST(csvPost('/api/v1/sites/import?mode=commit', fixed), noParams)).status).toBe(201);
    const text = await (await siteExport.GET(get('/api/v1/sites/export?q=fx-1'), noParams)).text();
    const rows = parse(text);
    expect(rows).toHaveLength(1);
    expect(rows[0].address_line1).toBe('\'=HYPERLINK("http://evil.test")');
    expect(text).not.toMatch(/(^|,)=HYPERLINK/m);
  });

  it('every list exports all its rows as CSV, scoped to the organisation', async () => {
    asOffice();
    const sites = parse(await (await siteExport.GET(get('/api/v1/sites/export?sort=reference'), noParams)).text());
    expect(sites.length).toBe(Number((await db()('sites').where({ organisation_id: demoIds.org }).count({ n: '*' }))[0].n));
    expect(sites.some((s) => s.reference === 'DM-1')).toBe(false);
    const appliances = parse(await (await applianceExport.GET(get('/api/v1/appliances/export'), noParams)).text());
    expect(appliances.length).toBeGreaterThan(60);
    expect(Object.keys(appliances[0])).toContain('site_reference');
    for (const [route, url, minimum] of [[customerExport, '/api/v1/customers/export', 7], [analyserExport, '/api/v1/analysers/export', 3], [userExport, '/api/v1/users/export', 10], [auditExport, '/api/v1/audit/export?dir=desc', 3], [renewalExport, '/api/v1/renewals/export', 30]] as const) {
      const res = await route.GET(get(url), noParams);
      expect(res.headers.get('content-type')).toContain('text/csv');
      expect(parse(await res.text()).length, url).toBeGreaterThanOrEqual(minimum);
    }
    expect((await siteExport.GET(get('/api/v1/sites/export?sort=secret'), noParams)).status).toBe(400);
  });
});
