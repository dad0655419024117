// Certificates end to end through the route handlers on a real database: issue from a submitted
// visit, the PDF's text against the inspection, immutability (409s), void and re-issue, the public
// check page, warning notices, send-back, and who may see which certificate.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createHash } from 'node:crypto';
import { extractText, getDocumentProxy } from 'unpdf';
import { cloneElement, type ReactElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { freshDatabase } from '@/tests/support/db';
import { get, params, postJson, signInAs } from '@/tests/support/session';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { closeDb, db } from '@/db/knex';
import { getOpenVisitReturn } from '@/db/certificates';
import { CAUTION_LINES } from '@/components/safety/caution';
import { createRateLimiter } from '@/lib/certificates/rate-limit';
import { maskAddress } from '@/lib/certificates/mask';
import * as issueRoute from '@/app/api/v1/review/[visitId]/issue/route';
import * as sendBackRoute from '@/app/api/v1/review/[visitId]/send-back/route';
import * as reviewRoute from '@/app/api/v1/review/route';
import * as listRoute from '@/app/api/v1/certificates/route';
import * as oneRoute from '@/app/api/v1/certificates/[id]/route';
import * as pdfRoute from '@/app/api/v1/certificates/[id]/pdf/route';
import * as voidRoute from '@/app/api/v1/certificates/[id]/void/route';
import * as noticeRoute from '@/app/api/v1/visits/[id]/warning-notices/[findingId]/pdf/route';
import * as portalSitesRoute from '@/app/api/v1/portal/sites/route';
import * as portalSiteRoute from '@/app/api/v1/portal/sites/[id]/route';
import * as renewalRoute from '@/app/api/v1/portal/renewal-requests/route';
import * as sitesRoute from '@/app/api/v1/sites/route';
import CheckPage from '@/app/check/[token]/page';

vi.mock('next/headers', () => ({ headers: async () => new Headers({ 'x-forwarded-for': '203.0.113.9' }) }));

const account = (email: string) => DEMO_ACCOUNTS.find((a) => a.email === email)!;
const who = (email: string, org = demoIds.org) => ({ id: account(email).id, role: account(email).role, organisationId: org, name: account(email).name });
const office = who('margo.felling@kilnbrook.test');
const priya = who('priya.oduya@kilnbrook.test');
const tomasz = who('tomasz.reilly@kilnbrook.test');
const dev = who('dev.anand@harbourline.test'); // landlord of sites 0, 3, 6, 9, 12 …
const celia = who('celia.marsh@landlords.test'); // another landlord
const hal = who('hal.brennick@homes.test'); // homeowner
const otherOffice = who('office@dunmere.test', demoIds.otherOrg);

const dangerVisit = demoIds.visit(9, 91);
const clearVisit = demoIds.visit(12, 92);

type CertJson = { id: string; numberText: string; status: string; visitId: string; siteId: string; replacesId: string | null; replacedById: string | null; voidedAt: string | null; pdfSha256: string; content: { checkUrl: string; findings: Array<{ id: string; severity: string }> } };

async function pdfText(res: Response): Promise<string> {
  const bytes = new Uint8Array(await res.arrayBuffer());
  const doc = await getDocumentProxy(bytes);
  const { text } = await extractText(doc, { mergePages: true });
  return text.replace(/\s+/g, ' ');
}

async function detail(id: string): Promise<CertJson> {
  signInAs(office);
  const res = await oneRoute.GET(get(`/api/v1/certificates/${id}`), params({ id }));
  expect(res.status).toBe(200);
  return ((await res.json()) as { certificate: CertJson }).certificate;
}

async function checkPage(token: string): Promise<string> {
  const element = await CheckPage({ params: Promise.resolve({ token }) });
  // The page renders an async child: resolve it the way the server would before rendering.
  const resolveTree = async (node: unknown): Promise<unknown> => {
    if (!node || typeof node !== 'object') return node;
    const el = node as { type: unknown; props: Record<string, unknown> };
    if (typeof el.type === 'function' && el.type.constructor.name === 'AsyncFunction') return resolveTree(await (el.type as (p: unknown) => Promise<unknown>)(el.props));
    if (el.props?.children) {
      // Handed back as separate arguments, the children stay the fixed list JSX wrote (no keys needed).
      const children = Array.isArray(el.props.children) ? await Promise.all(el.props.children.map(resolveTree)) : [await resolveTree(el.props.children)];
      return cloneElement(node as ReactElement, undefined, ...(children as ReactElement[]));
    }
    return node;
  };
  return renderToStaticMarkup((await resolveTree(element)) as React.ReactElement);
}

function tokenOf(cert: CertJson): string {
  return cert.content.checkUrl.split('/check/')[1]!;
}

let issuedId = '';

beforeAll(async () => {
  await freshDatabase({ seed: true });
}, 180_000);

afterAll(async () => {
  vi.useRealTimers();
  await closeDb();
});

describe('the demo', () => {
  it('has a valid, an expired and a void certificate, and submitted visits waiting for review', async () => {
    signInAs(office);
    const res = await listRoute.GET(get('/api/v1/certificates'), { params: Promise.resolve({}) } as never);
    const { items } = (await res.json()) as { items: CertJson[] };
    const statuses = items.map((c) => c.status);
    expect(statuses).toContain('valid');
    expect(statuses).toContain('expired');
    expect(statuses).toContain('void');
    const voided = items.find((c) => c.status === 'void')!;
    expect(voided.replacedById).toBeTruthy();
    const queue = (await (await reviewRoute.GET(get('/api/v1/review'), { params: Promise.resolve({}) } as never)).json()) as { items: Array<{ visitId: string }> };
    expect(queue.items.map((i) => i.visitId)).toEqual(expect.arrayContaining([dangerVisit, clearVisit]));
  });
});

describe('issuing a certificate', () => {
  it('numbers it, freezes it, stores the PDF digest, and the PDF text matches the inspection', async () => {
    signInAs(office);
    const before = Number((await db()('certificate_counters').where({ organisation_id: demoIds.org }).first('last_number')).last_number);
    const res = await issueRoute.POST(postJson(`/api/v1/review/${dangerVisit}/issue`, { send: false }), params({ visitId: dangerVisit }));
    expect(res.status).toBe(201);
    const { certificate } = (await res.json()) as { certificate: { certificateId: string; numberText: string } };
    issuedId = certificate.certificateId;
    expect(certificate.numberText).toBe(`KILN-C${String(before + 1).padStart(6, '0')}`);
    const visit = await db()('visits').where({ id: dangerVisit }).first('status');
    expect(visit.status).toBe('certified');

    const cert = await detail(issuedId);
    const pdfRes = await pdfRoute.GET(get(`/api/v1/certificates/${issuedId}/pdf`), params({ id: issuedId }));
    expect(pdfRes.headers.get('content-type')).toBe('application/pdf');
    const bytes = Buffer.from(await pdfRes.clone().arrayBuffer());
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(cert.pdfSha256);
    const text = await pdfText(pdfRes);
    expect(text).toContain(certificate.numberText);

    // Every current reading of the visit, with its ratio and air-free CO worked out here from the
    // formulas (combustion-figures.md: ratio = CO/10000/CO2; air-free = CO × 20.9 / (20.9 − O2)).
    const readings: Array<{ co_ppm: number; co2_pct: number | null; o2_pct: number | null }> = await db()('readings as r')
      .join('inspections as i', 'i.id', 'r.inspection_id')
      .where('i.visit_id', dangerVisit)
      .select('r.co_ppm', 'r.co2_pct', 'r.o2_pct');
    expect(readings.length).toBeGreaterThan(0);
    for (const r of readings) {
      expect(text).toContain(String(r.co_ppm));
      if (r.co2_pct !== null) expect(text).toContain(((r.co_ppm / 10000) / r.co2_pct).toFixed(4));
      if (r.o2_pct !== null) expect(text).toContain(((r.co_ppm * 20.9) / (20.9 - r.o2_pct)).toFixed(0));
    }
    // The verdict of each appliance as recorded on submit, and the rule that decided it.
    const inspections: Array<{ verdict_of_record: string; verdict_json: string; appliance_json: string }> = await db()('inspections').where({ visit_id: dangerVisit }).select('verdict_of_record', 'verdict_json', 'appliance_json');
    const words: Record<string, string> = { clear: 'Clear', service: 'Service advised', danger: 'Danger', unknown: 'Not judged' };
    for (const i of inspections) {
      expect(text).toContain(`Verdict: ${words[i.verdict_of_record]}.`);
      expect(text).toContain(JSON.parse(i.appliance_json).location);
      const decided = JSON.parse(i.verdict_json).decidedBy as { explanation: string } | null;
      if (decided) expect(text.toLowerCase()).toContain(decided.explanation.replace(/\s+/g, ' ').slice(0, 40).toLowerCase());
    }
    expect(inspections.some((i) => i.verdict_of_record === 'danger')).toBe(true);
    for (const line of CAUTION_LINES) expect(text).toContain(line.slice(0, 60));
    expect(text).toContain('Priya Oduya');
    expect(text).toContain('REG 604417');
  });

  it('makes one warning notice per danger finding, for the assigned engineer and the office only', async () => {
    const cert = await detail(issuedId);
    const danger = cert.content.findings.find((f) => f.severity === 'danger')!;
    signInAs(priya);
    const res = await noticeRoute.GET(get(`/api/v1/visits/${dangerVisit}/warning-notices/${danger.id}/pdf`), params({ id: dangerVisit, findingId: danger.id }));
    expect(res.status).toBe(200);
    const text = await pdfText(res);
    expect(text).toContain('DANGER: DO NOT USE');
    expect(text).toContain('flue found partly blocked');
    expect(text).toContain('Kilnbrook Heating Safety Ltd');
    signInAs(tomasz);
    expect((await noticeRoute.GET(get('/x'), params({ id: dangerVisit, findingId: danger.id }))).status).toBe(404);
    signInAs(dev);
    expect((await noticeRoute.GET(get('/x'), params({ id: dangerVisit, findingId: danger.id }))).status).toBe(403);
  });
});

describe('an issued certificate never changes', () => {
  it('answers 409 to every attempt to edit, delete or issue it again', async () => {
    signInAs(office);
    const body = { content: { overall: 'clear' } };
    for (const method of ['PUT', 'PATCH', 'DELETE'] as const) {
      const req = new Request(`http://localhost:3000/api/v1/certificates/${issuedId}`, { method, headers: { 'content-type': 'application/json' }, body: method === 'DELETE' ? undefined : JSON.stringify(body) });
      const res = await oneRoute[method](req, params({ id: issuedId }));
      expect(res.status, method).toBe(409);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('conflict');
    }
    const again = await issueRoute.POST(postJson(`/api/v1/review/${dangerVisit}/issue`, { send: false }), params({ visitId: dangerVisit }));
    expect(again.status).toBe(409);
    const stored = await db()('certificates').where({ id: issuedId }).first('content_json', 'pdf_sha256');
    const cert = await detail(issuedId);
    expect(cert.pdfSha256).toBe(stored.pdf_sha256);
  });

  it('voids only with a reason, re-issues under a new number, keeps both linked and the void one readable', async () => {
    signInAs(office);
    const noReason = await voidRoute.POST(postJson(`/api/v1/certificates/${issuedId}/void`, { reason: '' }), params({ id: issuedId }));
    expect(noReason.status).toBe(422);
    const old = await detail(issuedId);
    const res = await voidRoute.POST(postJson(`/api/v1/certificates/${issuedId}/void`, { reason: 'Gas fire recorded against the wrong room.', reissue: true }), params({ id: issuedId }));
    expect(res.status).toBe(200);
    const { reissued } = (await res.json()) as { reissued: { certificateId: string; numberText: string } };
    expect(reissued.numberText).not.toBe(old.numberText);
    const voided = await detail(issuedId);
    const fresh = await detail(reissued.certificateId);
    expect(voided.status).toBe('void');
    expect(voided.replacedById).toBe(fresh.id);
    expect(fresh.replacesId).toBe(voided.id);
    expect(fresh.status).toBe('valid');
    expect(voided.pdfSha256).toBe(old.pdfSha256);
    const again = await voidRoute.POST(postJson(`/api/v1/certificates/${issuedId}/void`, { reason: 'Second try at voiding.' }), params({ id: issuedId }));
    expect(again.status).toBe(409);
    // The void one stays readable, marked VOID; the untouched original is still there for the office.
    const marked = await pdfText(await pdfRoute.GET(get(`/api/v1/certificates/${issuedId}/pdf`), params({ id: issuedId })));
    expect(marked).toContain('VOID');
    expect(marked).toContain(`replaced by certificate ${fresh.numberText}`);
    const original = await pdfRoute.GET(get(`/api/v1/certificates/${issuedId}/pdf?original=1`), params({ id: issuedId }));
    expect(createHash('sha256').update(Buffer.from(await original.arrayBuffer())).digest('hex')).toBe(old.pdfSha256);
    const freshText = await pdfText(await pdfRoute.GET(get('/x'), params({ id: fresh.id })));
    expect(freshText).toContain(`replaces certificate ${old.numberText}`);
  });
});

describe('the public check page', () => {
  it('shows valid, then void after voiding; and expired once the date passes', async () => {
    signInAs(office);
    const list = (await (await listRoute.GET(get('/api/v1/certificates?status=valid'), { params: Promise.resolve({}) } as never)).json()) as { items: CertJson[] };
    const valid = await detail(list.items.find((c) => c.visitId === demoIds.visit(0, 0))!.id);
    const html = await checkPage(tokenOf(valid));
    expect(html).toContain('data-status="valid"');
    expect(html).toContain(valid.numberText);
    // Nothing personal: no landlord, tenant or house number.
    const site = await db()('sites').where({ id: valid.siteId }).first();
    expect(html).not.toContain(String(site.tenant_name));
    expect(html).not.toContain(String(site.address_line1));
    expect(html).not.toContain('Dev Anand');
    expect(html).toContain(maskAddress({ addressLine1: site.address_line1, town: site.town, postcode: site.postcode }).replace(/&/g, '&amp;'));

    const expires = new Date(`${(await db()('certificates').where({ id: valid.id }).first('expires_on')).expires_on}T12:00:00Z`);
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date(expires.getTime() + 2 * 86400_000));
    expect(await checkPage(tokenOf(valid))).toContain('data-status="expired"');
    vi.useRealTimers();

    const voidRes = await voidRoute.POST(postJson(`/api/v1/certificates/${valid.id}/void`, { reason: 'Issued against the wrong visit.' }), params({ id: valid.id }));
    expect(voidRes.status).toBe(200);
    expect(await checkPage(tokenOf(valid))).toContain('data-status="void"');
  });

  it('answers an unknown or malformed token with the same 404', async () => {
    for (const token of ['A'.repeat(43), 'not-a-token', 'x']) {
      await expect(checkPage(token)).rejects.toMatchObject({ digest: expect.stringContaining('404') });
    }
  });

  it('limits checks per address', () => {
    const limiter = createRateLimiter({ limit: 3, windowMs: 60_000 });
    expect([1, 2, 3, 4].map(() => limiter.hit('198.51.100.1', 1000))).toEqual([true, true, true, false]);
    expect(limiter.hit('198.51.100.2', 1000)).toBe(true);
    expect(limiter.hit('198.51.100.1', 62_000)).toBe(true);
  });
});

describe('who sees which certificate', () => {
  it('a landlord gets their own PDFs and a 404 for another landlord’s; other organisations see nothing', async () => {
    signInAs(dev);
    const mine = (await (await listRoute.GET(get('/api/v1/certificates'), { params: Promise.resolve({}) } as never)).json()) as { items: CertJson[] };
    expect(mine.items.length).toBeGreaterThan(0);
    const one = mine.items[0]!;
    expect((await pdfRoute.GET(get('/x'), params({ id: one.id }))).status).toBe(200);
    signInAs(celia);
    expect((await pdfRoute.GET(get('/x'), params({ id: one.id }))).status).toBe(404);
    expect((await oneRoute.GET(get('/x'), params({ id: one.id }))).status).toBe(404);
    const celiaList = (await (await listRoute.GET(get('/api/v1/certificates'), { params: Promise.resolve({}) } as never)).json()) as { items: CertJson[] };
    expect(celiaList.items.map((c) => c.id)).not.toContain(one.id);
    signInAs(otherOffice);
    expect((await pdfRoute.GET(get('/x'), params({ id: one.id }))).status).toBe(404);
    signInAs(priya);
    expect((await pdfRoute.GET(get('/x'), params({ id: one.id }))).status).toBe(403);
  });

  it('a homeowner cannot list or open a landlord’s sites', async () => {
    signInAs(hal);
    const sites = (await (await sitesRoute.GET(get('/api/v1/sites?pageSize=100'), { params: Promise.resolve({}) } as never)).json()) as { items: Array<{ id: string }> };
    const portal = (await (await portalSitesRoute.GET(get('/api/v1/portal/sites'), { params: Promise.resolve({}) } as never)).json()) as { items: Array<{ id: string }> };
    for (const list of [sites.items, portal.items]) {
      expect(list.length).toBe(2);
      expect(list.map((s) => s.id)).not.toContain(demoIds.site(0));
    }
    expect((await portalSiteRoute.GET(get('/x'), params({ id: demoIds.site(0) }))).status).toBe(404);
    const renewal = await renewalRoute.POST(postJson('/api/v1/portal/renewal-requests', { siteId: demoIds.site(0) }), { params: Promise.resolve({}) } as never);
    expect(renewal.status).toBe(404);
  });

  it('the landlord portal shows status, expiry and open remedial findings, and books a renewal once', async () => {
    signInAs(dev);
    const portal = (await (await portalSitesRoute.GET(get('/api/v1/portal/sites'), { params: Promise.resolve({}) } as never)).json()) as {
      items: Array<{ id: string; current: { status: string; expiresOn: string } | null; openFindings: Array<{ severity: string }> }>;
    };
    const site3 = portal.items.find((s) => s.id === demoIds.site(3))!;
    expect(site3.current?.status).toBe('valid');
    expect(site3.openFindings.map((f) => f.severity)).toEqual(['service']);
    const first = await renewalRoute.POST(postJson('/api/v1/portal/renewal-requests', { siteId: demoIds.site(3), note: 'Tenant prefers mornings' }), { params: Promise.resolve({}) } as never);
    expect(first.status).toBe(201);
    const second = await renewalRoute.POST(postJson('/api/v1/portal/renewal-requests', { siteId: demoIds.site(3) }), { params: Promise.resolve({}) } as never);
    expect(second.status).toBe(200);
  });
});

describe('sending a visit back', () => {
  it('returns it to the engineer with the comment, and it cannot be certified meanwhile', async () => {
    signInAs(office);
    const res = await sendBackRoute.POST(postJson(`/api/v1/review/${clearVisit}/send-back`, { comment: 'Please add the low-fire reading for the boiler.' }), params({ visitId: clearVisit }));
    expect(res.status).toBe(200);
    expect((await db()('visits').where({ id: clearVisit }).first('status')).status).toBe('on_site');
    expect((await getOpenVisitReturn({ organisationId: demoIds.org, visitId: clearVisit }))?.comment).toContain('low-fire');
    const issue = await issueRoute.POST(postJson(`/api/v1/review/${clearVisit}/issue`, { send: false }), params({ visitId: clearVisit }));
    expect(issue.status).toBe(409);
    const twice = await sendBackRoute.POST(postJson(`/api/v1/review/${clearVisit}/send-back`, { comment: 'And again, please.' }), params({ visitId: clearVisit }));
    expect(twice.status).toBe(409);
  });
});
