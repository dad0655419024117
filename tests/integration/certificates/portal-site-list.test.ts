// The portal's site list (db/certificates.ts listPortalSites) and the board's week of cards
// (db/schedule.ts listBoard) are single statements read as arrays; each is compared here with the
// plain reading they replaced: every site, certificate and request read separately and matched in
// code, and every visit read whole. Common practice, no source.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { listPortalSites, organisationToday, type PortalSite } from '@/db/certificates';
import { findClashes, getVisit, listBoard } from '@/db/schedule';
import type { SiteAudience } from '@/db/sites';
import { toDateOnly } from '@/db/rows';
import { certificateStatus } from '@/lib/certificates/status';
import { weekStart } from '@/lib/schedule/zoned';

type Row = Record<string, unknown>;

/** The list as it was read before: sites, then their certificates newest first, then open requests. */
async function reference(audience: SiteAudience): Promise<PortalSite[]> {
  const knex = db();
  const today = await organisationToday(audience.organisationId);
  const q = knex('sites').where('organisation_id', audience.organisationId);
  if (audience.landlordId) q.andWhere('landlord_id', audience.landlordId);
  if (audience.homeownerId) q.andWhere('homeowner_id', audience.homeownerId);
  const sites: Row[] = await q.orderBy('address_line1').orderBy('id');
  const ids = sites.map((s) => String(s.id));
  const certificates: Row[] = ids.length ? await knex('certificates').where('organisation_id', audience.organisationId).whereIn('site_id', ids).whereNull('voided_at').orderBy('issued_at', 'desc').orderBy('id', 'desc') : [];
  const requests: Row[] = ids.length ? await knex('renewal_requests').where({ organisation_id: audience.organisationId, status: 'open' }).whereIn('site_id', ids) : [];
  return sites.map((s) => {
    const c = certificates.find((x) => x.site_id === s.id);
    const content = c ? (JSON.parse(String(c.content_json)) as { findings?: Array<{ severity: string; description: string; applianceLabel: string | null; actionLabel: string }> }) : null;
    const expiresOn = c ? (toDateOnly(c.expires_on) ?? '') : '';
    return {
      id: String(s.id),
      reference: String(s.reference),
      address: [s.address_line1, s.address_line2].filter(Boolean).join(', '),
      town: String(s.town),
      postcode: String(s.postcode),
      current: c ? { id: String(c.id), numberText: String(c.number_text), issuedOn: toDateOnly(c.issued_on) ?? '', expiresOn, status: certificateStatus({ voidedAt: null, expiresOn, today }), overallVerdict: c.overall_verdict as 'clear' } : null,
      openFindings: (content?.findings ?? [])
        .filter((f) => f.severity === 'service' || f.severity === 'danger')
        .map((f) => ({ certificateNumberText: String(c!.number_text), severity: f.severity as 'service', description: f.description, applianceLabel: f.applianceLabel, actionLabel: f.actionLabel })),
      renewalRequested: requests.some((r) => r.site_id === s.id),
    };
  });
}

const audiences = (): SiteAudience[] => [
  ...DEMO_ACCOUNTS.filter((a) => a.role === 'landlord' && a.org !== 'other').map((a) => ({ organisationId: demoIds.org, landlordId: a.id })),
  ...DEMO_ACCOUNTS.filter((a) => a.role === 'homeowner' && a.org !== 'other').map((a) => ({ organisationId: demoIds.org, homeownerId: a.id })),
  { organisationId: demoIds.org },
];

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('portal site list', () => {
  it('matches the separate reads for every landlord and homeowner of the demo, and for a single site', async () => {
    let withCertificate = 0;
    for (const audience of audiences()) {
      const expected = await reference(audience);
      expect(await listPortalSites(audience)).toEqual(expected);
      withCertificate += expected.filter((s) => s.current).length;
      for (const site of expected.slice(0, 2)) expect(await listPortalSites(audience, site.id)).toEqual([site]);
    }
    expect(withCertificate).toBeGreaterThan(0);
  });

  it('shows the newest certificate not voided, and an open renewal request', async () => {
    const knex = db();
    const issued: Row | undefined = await knex('certificates').where('organisation_id', demoIds.org).whereNull('voided_at').whereNotNull('site_id').first();
    expect(issued).toBeDefined();
    const site: Row = await knex('sites').where('id', String(issued!.site_id)).first();
    const audience: SiteAudience = site.landlord_id ? { organisationId: demoIds.org, landlordId: String(site.landlord_id) } : { organisationId: demoIds.org, homeownerId: String(site.homeowner_id) };
    const copy = (n: number, extra: Row) => ({
      ...issued,
      id: `00000000-0000-4000-8000-00000000cc0${n}`,
      number: 990_000 + n,
      number_text: `TEST-${n}`,
      check_token_hash: `test-token-${n}`.padEnd(64, '0'),
      content_json: JSON.stringify({ findings: [{ severity: 'danger', description: `Finding ${n}`, applianceLabel: null, actionLabel: 'Made safe' }] }),
      ...extra,
    });
    // A newer one that was voided, then a newer one in force: the list shows the latter.
    await knex('certificates').insert(copy(1, { issued_at: new Date(Date.parse('2099-01-01T00:00:00Z')).toISOString(), voided_at: new Date().toISOString(), void_reason: 'test' }));
    await knex('certificates').insert(copy(2, { issued_at: new Date(Date.parse('2098-01-01T00:00:00Z')).toISOString() }));
    await knex('renewal_requests').insert({ id: '00000000-0000-4000-8000-00000000cc10', organisation_id: demoIds.org, site_id: site.id, requested_by: audience.landlordId ?? audience.homeownerId, status: 'open', created_at: new Date().toISOString() });
    const [shown] = await listPortalSites(audience, String(site.id));
    expect(shown!.current?.numberText).toBe('TEST-2');
    expect(shown!.openFindings.map((f) => f.description)).toEqual(['Finding 2']);
    expect(shown!.renewalRequested).toBe(true);
    expect(await listPortalSites(audience)).toEqual(await reference(audience));
  });
});

describe('board cards', () => {
  it('are the whole visits cut to what a card shows, with the same clash warnings', async () => {
    const visits: Row[] = await db()('visits').where('organisation_id', demoIds.org).orderBy('window_start');
    const from = weekStart(new Date(String(visits[Math.floor(visits.length / 2)]!.window_start)).toISOString().slice(0, 10));
    const board = await listBoard({ organisationId: demoIds.org, from, days: 28 });
    expect(board.visits.length).toBeGreaterThan(0);
    const whole = await Promise.all(board.visits.map((v) => getVisit(demoIds.org, v.id)));
    const clashes = findClashes(whole.map((w) => w!), board.timeZone);
    board.visits.forEach((card, i) => {
      const w = whole[i]!;
      expect(card).toEqual({
        id: w.id, siteId: w.siteId, siteReference: w.siteReference, address: w.address, town: w.town, postcode: w.postcode,
        engineerId: w.engineerId, engineerName: w.engineerName, kind: w.kind, status: w.status, windowStart: w.windowStart, windowEnd: w.windowEnd,
        warnings: clashes.get(w.id) ?? [],
      });
    });
  });
});
