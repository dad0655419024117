import 'server-only';
// Certificates and the office's review of submitted visits. An issued certificate is written once:
// nothing here updates its content, limits, number, dates or PDF; the only later write is voiding.
// Issue and re-issue take the visit from `submitted` to `certified` and the next number from the
// organisation's counter in one transaction, so a number is never skipped or used twice.
import type { Knex } from 'knex';
import { db } from './knex';
import { toDateOnly, toIso } from './rows';
import { selectArrays } from './array-rows';
import { recordAudit, type Actor } from './audit';
import { getVisitReport, type VisitReport } from './inspections';
import { loadLimitContextForSite } from './code-profiles';
import type { SiteAudience } from './sites';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import type { LimitContext } from '@/lib/field';
import type { ResolvedLimits, Verdict, VerdictLevel } from '@/lib/limits';
import { certificateStatus } from '@/lib/certificates/status';
import { maskAddress } from '@/lib/certificates/mask';
import type { CertificateContent, CertificateStatus } from '@/lib/certificates/types';

type Row = Record<string, unknown>;

function parse<T>(value: unknown, fallback: T): T {
  if (typeof value !== 'string' || value === '') return fallback;
  try {
    return JSON.parse(value) as T;
  } catch {
    return fallback;
  }
}

/** Today in the organisation's time zone: certificates are dated by the calendar, not the instant. */
export async function organisationToday(organisationId: string, at: Date = new Date()): Promise<string> {
  const row: Row | undefined = await db()('organisations').where({ id: organisationId }).first('time_zone');
  return new Intl.DateTimeFormat('en-CA', { timeZone: String(row?.time_zone ?? 'UTC'), year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

// ---------------------------------------------------------------------------------------------
// Review queue and review screen

export type ReviewQueueItem = {
  visitId: string;
  siteId: string;
  siteReference: string;
  address: string;
  town: string;
  engineerName: string | null;
  submittedAt: string | null;
  overallVerdict: VerdictLevel | null;
  /** The void certificate this visit's next issue will replace, if any. */
  replacesNumberText: string | null;
};

export async function listReviewQueue(organisationId: string): Promise<ReviewQueueItem[]> {
  const rows: Row[] = await db()('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where({ 'v.organisation_id': organisationId, 'v.status': 'submitted' })
    .select('v.id', 'v.site_id', 'v.submitted_at', 'v.overall_verdict', 's.reference', 's.address_line1', 's.address_line2', 's.town', 'u.name as engineer_name')
    .orderBy('v.submitted_at', 'asc')
    .orderBy('v.id', 'asc');
  const voided = rows.length ? await pendingReplacements(db(), rows.map((r) => String(r.id))) : new Map<string, { id: string; numberText: string }>();
  return rows.map((r) => ({
    visitId: String(r.id),
    siteId: String(r.site_id),
    siteReference: String(r.reference),
    address: [r.address_line1, r.address_line2].filter(Boolean).join(', '),
    town: String(r.town),
    engineerName: (r.engineer_name as string | null) ?? null,
    submittedAt: toIso(r.submitted_at),
    overallVerdict: (r.overall_verdict as VerdictLevel | null) ?? null,
    replacesNumberText: voided.get(String(r.id))?.numberText ?? null,
  }));
}

/** Per visit, the latest void certificate that no later certificate replaces yet. */
async function pendingReplacements(trx: Knex, visitIds: string[]): Promise<Map<string, { id: string; numberText: string }>> {
  const rows: Row[] = await trx('certificates as c')
    .whereIn('c.visit_id', visitIds)
    .whereNotNull('c.voided_at')
    .whereNotExists(trx('certificates as n').whereRaw('n.replaces_id = c.id'))
    .select('c.id', 'c.visit_id', 'c.number_text', 'c.voided_at')
    .orderBy('c.voided_at', 'asc');
  const out = new Map<string, { id: string; numberText: string }>();
  for (const r of rows) out.set(String(r.visit_id), { id: String(r.id), numberText: String(r.number_text) });
  return out;
}

export type VisitReturn = { id: string; comment: string; returnedAt: string; returnedByName: string | null };

export type ReviewBundle = VisitReport & {
  signature: { photoId: string | null; occupantName: string | null; noSignatureReason: string | null } | null;
  analyserOverrides: Array<{ analyserSerial: string; reason: string; calibrationDue: string; engineerName: string | null; at: string }>;
  returns: VisitReturn[];
  certificates: CertificateSummary[];
  installation: { verdict: Verdict; limits: ResolvedLimits } | null;
};

export async function getReviewBundle(organisationId: string, visitId: string): Promise<ReviewBundle | null> {
  const report = await getVisitReport({ organisationId, visitId });
  if (!report) return null;
  const knex = db();
  const overrides: Row[] = await knex('analyser_overrides as o')
    .join('analysers as a', 'a.id', 'o.analyser_id')
    .leftJoin('users as u', 'u.id', 'o.engineer_id')
    .where({ 'o.visit_id': visitId, 'o.organisation_id': organisationId })
    .select('a.serial', 'o.reason', 'o.calibration_due', 'o.at', 'u.name as engineer_name')
    .orderBy('o.at');
  const visit: Row | undefined = await knex('visits').where({ id: visitId, organisation_id: organisationId }).first('installation_verdict_json', 'installation_limits_json');
  const verdict = parse<Verdict | null>(visit?.installation_verdict_json, null);
  const limits = parse<ResolvedLimits | null>(visit?.installation_limits_json, null);
  const signoff = report.records.signoff;
  return {
    ...report,
    signature: signoff ? { photoId: signoff.signaturePhotoId, occupantName: signoff.occupantName, noSignatureReason: signoff.noSignatureReason } : null,
    analyserOverrides: overrides.map((o) => ({
      analyserSerial: String(o.serial),
      reason: String(o.reason),
      calibrationDue: toDateOnly(o.calibration_due) ?? '',
      engineerName: (o.engineer_name as string | null) ?? null,
      at: toIso(o.at) ?? '',
    })),
    returns: await listVisitReturns(organisationId, visitId),
    certificates: (await listCertificates({ organisationId }, { visitId })).items,
    installation: verdict && limits ? { verdict, limits } : null,
  };
}

/** A stored visit photo (or signature) of the organisation: its storage key and type. */
export async function getVisitPhotoRef(input: { organisationId: string; visitId: string; photoId: string }): Promise<{ key: string; mime: string } | null> {
  const row: Row | undefined = await db()('photos').where({ id: input.photoId, visit_id: input.visitId, organisation_id: input.organisationId }).first('storage_key', 'mime');
  return row ? { key: String(row.storage_key), mime: String(row.mime) } : null;
}

export async function listVisitReturns(organisationId: string, visitId: string): Promise<VisitReturn[]> {
  const rows: Row[] = await db()('visit_returns as r')
    .leftJoin('users as u', 'u.id', 'r.returned_by')
    .where({ 'r.visit_id': visitId, 'r.organisation_id': organisationId })
    .select('r.id', 'r.comment', 'r.returned_at', 'u.name as returned_by_name')
    .orderBy('r.returned_at', 'desc');
  return rows.map((r) => ({ id: String(r.id), comment: String(r.comment), returnedAt: toIso(r.returned_at) ?? '', returnedByName: (r.returned_by_name as string | null) ?? null }));
}

/**
 * The office's comment on a visit it sent back, while the visit is still with the engineer
 * (status on_site); null once it is submitted again. For the field app to show.
 */
export async function getOpenVisitReturn(input: { organisationId: string; visitId: string }): Promise<VisitReturn | null> {
  const visit: Row | undefined = await db()('visits').where({ id: input.visitId, organisation_id: input.organisationId }).first('status');
  if (!visit || visit.status !== 'on_site') return null;
  return (await listVisitReturns(input.organisationId, input.visitId))[0] ?? null;
}

/** Submitted → on_site with the office's comment. Anything but a submitted visit is a 409. */
export async function sendVisitBack(input: { actor: Actor; visitId: string; comment: string }): Promise<VisitReturn> {
  const { actor } = input;
  const id = newId();
  const now = new Date().toISOString();
  await db().transaction(async (trx) => {
    const visit: Row | undefined = await trx('visits').where({ id: input.visitId, organisation_id: actor.organisationId }).first('id', 'status');
    if (!visit) throw new AppError('not_found', 'No such visit.');
    const changed = await trx('visits').where({ id: input.visitId, organisation_id: actor.organisationId, status: 'submitted' }).update({ status: 'on_site', updated_at: now });
    if (changed !== 1) throw new AppError('conflict', `Only a submitted visit can be sent back; this one is ${String(visit.status).replace('_', ' ')}.`);
    await trx('visit_returns').insert({ id, organisation_id: actor.organisationId, visit_id: input.visitId, comment: input.comment, returned_by: actor.userId, returned_at: now });
    await recordAudit(trx, { actor, entity: 'visit', entityId: input.visitId, action: 'send_back', summary: `Sent the visit back to the engineer: ${input.comment.slice(0, 200)}`, after: { status: 'on_site' } });
  });
  return (await listVisitReturns(actor.organisationId, input.visitId))[0]!;
}

// ---------------------------------------------------------------------------------------------
// Issuing

export type IssueSource = {
  report: ReviewBundle;
  installation: { verdict: Verdict; limits: ResolvedLimits } | null;
  limits: LimitContext;
  organisation: { name: string; slug: string; address: string | null; phone: string | null; email: string | null; registrationNumber: string | null };
  engineer: { name: string; registrationNumber: string | null };
  site: { addressLine1: string; addressLine2: string | null; reference: string; town: string; postcode: string; jurisdictionName: string };
  policy: { periodMonths: number; earlyRenewalDays: number; source: string | null };
  /** The latest expiry of the site's other certificates that still count (not void). */
  previousExpiry: string | null;
  replaces: { id: string; numberText: string; expiresOn: string } | null;
};

/** Everything a certificate is built from; 404 for a visit outside the organisation. */
export async function loadIssueSource(organisationId: string, visitId: string): Promise<IssueSource> {
  const knex = db();
  const bundle = await getReviewBundle(organisationId, visitId);
  if (!bundle) throw new AppError('not_found', 'No such visit.');
  const v: Row = await knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .join('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .join('organisations as o', 'o.id', 'v.organisation_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where({ 'v.id': visitId, 'v.organisation_id': organisationId })
    .first(
      's.address_line1', 's.address_line2', 's.reference', 's.town', 's.postcode', 'v.site_id',
      'j.name as jurisdiction_name', 'j.certificate_period_months', 'j.early_renewal_days', 'j.renewal_rule_source',
      'o.name as org_name', 'o.slug', 'o.address as org_address', 'o.phone as org_phone', 'o.email as org_email', 'o.registration_number as org_registration',
      'u.name as engineer_name', 'u.registration_number as engineer_registration',
    );
  const previous: Row | undefined = await knex('certificates')
    .where({ organisation_id: organisationId, site_id: String(v.site_id) })
    .whereNot({ visit_id: visitId })
    .whereNull('voided_at')
    .orderBy('expires_on', 'desc')
    .first('expires_on');
  const pending = (await pendingReplacements(knex, [visitId])).get(visitId) ?? null;
  const replacedRow: Row | undefined = pending ? await knex('certificates').where({ id: pending.id }).first('expires_on') : undefined;
  return {
    report: bundle,
    installation: bundle.installation,
    limits: await loadLimitContextForSite({ organisationId, siteId: String(v.site_id) }),
    organisation: {
      name: String(v.org_name),
      slug: String(v.slug),
      address: (v.org_address as string | null) ?? null,
      phone: (v.org_phone as string | null) ?? null,
      email: (v.org_email as string | null) ?? null,
      registrationNumber: (v.org_registration as string | null) ?? null,
    },
    engineer: { name: String(v.engineer_name ?? 'Unassigned'), registrationNumber: (v.engineer_registration as string | null) ?? null },
    site: {
      addressLine1: String(v.address_line1),
      addressLine2: (v.address_line2 as string | null) ?? null,
      reference: String(v.reference),
      town: String(v.town),
      postcode: String(v.postcode),
      jurisdictionName: String(v.jurisdiction_name),
    },
    policy: { periodMonths: Number(v.certificate_period_months), earlyRenewalDays: Number(v.early_renewal_days), source: (v.renewal_rule_source as string | null) ?? null },
    previousExpiry: toDateOnly(previous?.expires_on),
    replaces: pending && replacedRow ? { ...pending, expiresOn: toDateOnly(replacedRow.expires_on) ?? '' } : null,
  };
}

export type BuiltCertificate = {
  id: string;
  numberText: string;
  issuedOn: string;
  expiresOn: string;
  issuedAt: string;
  overall: VerdictLevel;
  content: CertificateContent;
  limits: unknown;
  pdf: { key: string; sha256: string; bytes: number };
  checkTokenHash: string;
  notices: Array<{ findingId: string; key: string; sha256: string }>;
};

/**
 * Issues a certificate for a submitted visit. Inside one transaction: the visit moves to certified
 * (only from submitted: a second issue is a 409), the counter gives the next number, `build` makes
 * the content and stores the PDF under that number, and the row is written. If anything fails the
 * number is not used (the counter update rolls back with it).
 */
export async function issueCertificateRecord(input: {
  actor: Actor;
  visitId: string;
  replacesId: string | null;
  build: (number: number) => Promise<BuiltCertificate>;
}): Promise<string> {
  const { actor } = input;
  return db().transaction(async (trx) => {
    const visit: Row | undefined = await trx('visits').where({ id: input.visitId, organisation_id: actor.organisationId }).first('id', 'status', 'site_id');
    if (!visit) throw new AppError('not_found', 'No such visit.');
    const now = new Date().toISOString();
    const changed = await trx('visits').where({ id: input.visitId, organisation_id: actor.organisationId, status: 'submitted' }).update({ status: 'certified', certified_at: now, updated_at: now });
    if (changed !== 1) throw new AppError('conflict', visit.status === 'certified' ? 'This visit already has a certificate. To correct it, void it and issue again.' : `Only a submitted visit can be certified; this one is ${String(visit.status).replace('_', ' ')}.`);
    if (input.replacesId) {
      const replaced: Row | undefined = await trx('certificates').where({ id: input.replacesId, organisation_id: actor.organisationId, visit_id: input.visitId }).first('voided_at');
      if (!replaced?.voided_at) throw new AppError('conflict', 'Only a void certificate of this visit can be replaced.');
    }
    const number = await allocateCertificateNumber(trx, actor.organisationId);
    const built = await input.build(number);
    await trx('certificates').insert({
      id: built.id,
      organisation_id: actor.organisationId,
      site_id: String(visit.site_id),
      visit_id: input.visitId,
      number,
      number_text: built.numberText,
      issued_on: built.issuedOn,
      expires_on: built.expiresOn,
      issued_at: built.issuedAt,
      issued_by: actor.userId,
      overall_verdict: built.overall,
      content_json: JSON.stringify(built.content),
      limits_json: JSON.stringify(built.limits),
      pdf_key: built.pdf.key,
      pdf_sha256: built.pdf.sha256,
      pdf_bytes: built.pdf.bytes,
      check_token_hash: built.checkTokenHash,
      replaces_id: input.replacesId,
    });
    for (const n of built.notices) {
      await trx('certificate_notices').insert({ id: newId(), organisation_id: actor.organisationId, certificate_id: built.id, finding_id: n.findingId, pdf_key: n.key, pdf_sha256: n.sha256 });
    }
    await recordAudit(trx, {
      actor,
      entity: 'certificate',
      entityId: built.id,
      action: input.replacesId ? 'reissue' : 'issue',
      summary: `Issued certificate ${built.numberText} (expires ${built.expiresOn})`,
      after: { numberText: built.numberText, visitId: input.visitId, issuedOn: built.issuedOn, expiresOn: built.expiresOn, pdfSha256: built.pdf.sha256, replacesId: input.replacesId },
    });
    return built.id;
  });
}

/** The next number of the organisation; must run in the issuing transaction (the update takes the lock). */
export async function allocateCertificateNumber(trx: Knex.Transaction, organisationId: string): Promise<number> {
  await trx('certificate_counters').insert({ organisation_id: organisationId, last_number: 0 }).onConflict('organisation_id').ignore();
  await trx('certificate_counters').where({ organisation_id: organisationId }).increment('last_number', 1);
  const row: Row = await trx('certificate_counters').where({ organisation_id: organisationId }).first('last_number');
  return Number(row.last_number);
}

/**
 * Voids a certificate (reason required). It stays readable, marked void; its visit goes back to
 * the review queue so a corrected certificate can be issued under a new number. 409 when already void.
 */
export async function voidCertificate(input: { actor: Actor; id: string; reason: string }): Promise<void> {
  const { actor } = input;
  await db().transaction(async (trx) => {
    const row: Row | undefined = await trx('certificates').where({ id: input.id, organisation_id: actor.organisationId }).first('id', 'visit_id', 'number_text', 'voided_at');
    if (!row) throw new AppError('not_found', 'No such certificate.');
    const now = new Date().toISOString();
    const changed = await trx('certificates').where({ id: input.id, organisation_id: actor.organisationId }).whereNull('voided_at').update({ voided_at: now, voided_by: actor.userId, void_reason: input.reason });
    if (changed !== 1) throw new AppError('conflict', `Certificate ${String(row.number_text)} is already void.`);
    const stillValid = await trx('certificates').where({ visit_id: String(row.visit_id) }).whereNull('voided_at').first('id');
    if (!stillValid) await trx('visits').where({ id: String(row.visit_id), organisation_id: actor.organisationId, status: 'certified' }).update({ status: 'submitted', updated_at: now });
    await recordAudit(trx, { actor, entity: 'certificate', entityId: input.id, action: 'void', summary: `Voided certificate ${String(row.number_text)}: ${input.reason.slice(0, 200)}`, after: { voidedAt: now, reason: input.reason } });
  });
}

// ---------------------------------------------------------------------------------------------
// Reading certificates

export type CertificateSummary = {
  id: string;
  numberText: string;
  siteId: string;
  siteReference: string;
  address: string;
  town: string;
  postcode: string;
  visitId: string;
  issuedOn: string;
  expiresOn: string;
  issuedAt: string;
  overallVerdict: VerdictLevel;
  status: CertificateStatus;
  voidedAt: string | null;
  voidReason: string | null;
  replacesId: string | null;
  replacesNumberText: string | null;
  replacedById: string | null;
  replacedByNumberText: string | null;
};

export type CertificateDetail = CertificateSummary & {
  content: CertificateContent;
  pdfSha256: string;
  pdfBytes: number;
  issuedByName: string | null;
  voidedByName: string | null;
  notices: Array<{ findingId: string; description: string }>;
};

function scopedCertificates(knex: Knex, audience: SiteAudience) {
  const q = knex('certificates as c').join('sites as s', 's.id', 'c.site_id').where('c.organisation_id', audience.organisationId);
  if (audience.landlordId) q.andWhere('s.landlord_id', audience.landlordId);
  if (audience.homeownerId) q.andWhere('s.homeowner_id', audience.homeownerId);
  return q;
}

const SUMMARY_COLUMNS = [
  'c.id', 'c.number_text', 'c.site_id', 'c.visit_id', 'c.issued_on', 'c.expires_on', 'c.issued_at', 'c.overall_verdict', 'c.voided_at', 'c.void_reason', 'c.replaces_id',
  's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode',
  'p.number_text as replaces_number_text', 'n.id as replaced_by_id', 'n.number_text as replaced_by_number_text',
];

function withLinks(q: Knex.QueryBuilder) {
  return q.leftJoin('certificates as p', 'p.id', 'c.replaces_id').leftJoin('certificates as n', 'n.replaces_id', 'c.id');
}

function toSummary(r: Row, today: string): CertificateSummary {
  const expiresOn = toDateOnly(r.expires_on) ?? '';
  const voidedAt = toIso(r.voided_at);
  return {
    id: String(r.id),
    numberText: String(r.number_text),
    siteId: String(r.site_id),
    siteReference: String(r.reference),
    address: [r.address_line1, r.address_line2].filter(Boolean).join(', '),
    town: String(r.town),
    postcode: String(r.postcode),
    visitId: String(r.visit_id),
    issuedOn: toDateOnly(r.issued_on) ?? '',
    expiresOn,
    issuedAt: toIso(r.issued_at) ?? '',
    overallVerdict: r.overall_verdict as VerdictLevel,
    status: certificateStatus({ voidedAt, expiresOn, today }),
    voidedAt,
    voidReason: (r.void_reason as string | null) ?? null,
    replacesId: (r.replaces_id as string | null) ?? null,
    replacesNumberText: (r.replaces_number_text as string | null) ?? null,
    replacedById: (r.replaced_by_id as string | null) ?? null,
    replacedByNumberText: (r.replaced_by_number_text as string | null) ?? null,
  };
}

export type CertificateListFilter = { siteId?: string; visitId?: string; status?: CertificateStatus; q?: string; page?: number; pageSize?: number };

export async function listCertificates(audience: SiteAudience, filter: CertificateListFilter = {}): Promise<{ items: CertificateSummary[]; total: number }> {
  const knex = db();
  const today = await organisationToday(audience.organisationId);
  const q = scopedCertificates(knex, audience);
  if (filter.siteId) q.andWhere('c.site_id', filter.siteId);
  if (filter.visitId) q.andWhere('c.visit_id', filter.visitId);
  if (filter.status === 'void') q.whereNotNull('c.voided_at');
  if (filter.status === 'valid') q.whereNull('c.voided_at').andWhere('c.expires_on', '>=', today);
  if (filter.status === 'expired') q.whereNull('c.voided_at').andWhere('c.expires_on', '<', today);
  if (filter.q) {
    const like = `%${filter.q.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    q.andWhere((w) => w.whereRaw('lower(c.number_text) like ?', [like]).orWhere('s.search_text', 'like', like));
  }
  const [{ count }] = await q.clone().count<{ count: number | string }[]>({ count: '*' });
  const pageSize = filter.pageSize ?? 100;
  const rows: Row[] = await withLinks(q.clone())
    .select(SUMMARY_COLUMNS)
    .orderBy('c.issued_at', 'desc')
    .orderBy('c.number_text', 'desc')
    .limit(pageSize)
    .offset(((filter.page ?? 1) - 1) * pageSize);
  return { items: rows.map((r) => toSummary(r, today)), total: Number(count) };
}

/** One certificate in the audience's reach, or null (callers answer 404 either way). */
export async function getCertificate(audience: SiteAudience, id: string): Promise<CertificateDetail | null> {
  const knex = db();
  const row: Row | undefined = await withLinks(scopedCertificates(knex, audience).andWhere('c.id', id))
    .leftJoin('users as ib', 'ib.id', 'c.issued_by')
    .leftJoin('users as vb', 'vb.id', 'c.voided_by')
    .select([...SUMMARY_COLUMNS, 'c.content_json', 'c.pdf_sha256', 'c.pdf_bytes', 'ib.name as issued_by_name', 'vb.name as voided_by_name'])
    .first();
  if (!row) return null;
  const today = await organisationToday(audience.organisationId);
  const content = parse<CertificateContent>(row.content_json, {} as CertificateContent);
  const noticeRows: Row[] = await knex('certificate_notices').where({ certificate_id: id }).select('finding_id');
  const findingText = new Map(content.findings.map((f) => [f.id, f.description]));
  return {
    ...toSummary(row, today),
    content,
    pdfSha256: String(row.pdf_sha256),
    pdfBytes: Number(row.pdf_bytes),
    issuedByName: (row.issued_by_name as string | null) ?? null,
    voidedByName: (row.voided_by_name as string | null) ?? null,
    notices: noticeRows.map((n) => ({ findingId: String(n.finding_id), description: findingText.get(String(n.finding_id)) ?? '' })),
  };
}

/** Where a certificate's stored PDF is, for the download route (which checks the digest). */
export async function getCertificatePdfRef(audience: SiteAudience, id: string): Promise<{ key: string; sha256: string; numberText: string; voided: boolean } | null> {
  const row: Row | undefined = await scopedCertificates(db(), audience).andWhere('c.id', id).first('c.pdf_key', 'c.pdf_sha256', 'c.number_text', 'c.voided_at');
  return row ? { key: String(row.pdf_key), sha256: String(row.pdf_sha256), numberText: String(row.number_text), voided: Boolean(row.voided_at) } : null;
}

/** The stored warning notice for a finding on the visit's current (or latest) certificate. */
export async function getStoredNoticeRef(input: { organisationId: string; visitId: string; findingId: string }): Promise<{ key: string; sha256: string } | null> {
  const row: Row | undefined = await db()('certificate_notices as n')
    .join('certificates as c', 'c.id', 'n.certificate_id')
    .where({ 'c.visit_id': input.visitId, 'c.organisation_id': input.organisationId, 'n.finding_id': input.findingId })
    .orderByRaw('case when c.voided_at is null then 0 else 1 end')
    .orderBy('c.issued_at', 'desc')
    .first('n.pdf_key', 'n.pdf_sha256');
  return row ? { key: String(row.pdf_key), sha256: String(row.pdf_sha256) } : null;
}

export type PublicCheck = { numberText: string; maskedAddress: string; issuedOn: string; expiresOn: string; status: CertificateStatus; organisationName: string };

/** The public check page's view: no names, no e-mail, no findings. */
export async function getCertificateForCheck(tokenHash: string): Promise<PublicCheck | null> {
  const row: Row | undefined = await db()('certificates as c')
    .join('sites as s', 's.id', 'c.site_id')
    .join('organisations as o', 'o.id', 'c.organisation_id')
    .where('c.check_token_hash', tokenHash)
    .first('c.organisation_id', 'c.number_text', 'c.issued_on', 'c.expires_on', 'c.voided_at', 's.address_line1', 's.town', 's.postcode', 'o.name as org_name');
  if (!row) return null;
  const today = await organisationToday(String(row.organisation_id));
  const expiresOn = toDateOnly(row.expires_on) ?? '';
  return {
    numberText: String(row.number_text),
    maskedAddress: maskAddress({ addressLine1: String(row.address_line1), town: String(row.town), postcode: String(row.postcode) }),
    issuedOn: toDateOnly(row.issued_on) ?? '',
    expiresOn,
    status: certificateStatus({ voidedAt: toIso(row.voided_at), expiresOn, today }),
    organisationName: String(row.org_name),
  };
}

// ---------------------------------------------------------------------------------------------
// Portal: a landlord's or homeowner's own sites with where their certificate stands

export type OpenFinding = { certificateNumberText: string; severity: 'service' | 'danger'; description: string; applianceLabel: string | null; actionLabel: string };

export type PortalSite = {
  id: string;
  reference: string;
  address: string;
  town: string;
  postcode: string;
  current: { id: string; numberText: string; issuedOn: string; expiresOn: string; status: CertificateStatus; overallVerdict: VerdictLevel } | null;
  openFindings: OpenFinding[];
  renewalRequested: boolean;
};

/** Service and danger findings on the site's current certificate: the remedial work still owed. */
function openFindingsOf(numberText: string, content: CertificateContent): OpenFinding[] {
  return (content.findings ?? [])
    .filter((f): f is typeof f & { severity: 'service' | 'danger' } => f.severity === 'service' || f.severity === 'danger')
    .map((f) => ({ certificateNumberText: numberText, severity: f.severity, description: f.description, applianceLabel: f.applianceLabel, actionLabel: f.actionLabel }));
}

export async function listPortalSites(audience: SiteAudience, siteId?: string): Promise<PortalSite[]> {
  const knex = db();
  const today = await organisationToday(audience.organisationId);
  // One statement: the audience's sites in address order, each with its latest certificate not
  // voided (the newest entry of the (organisation, site, voided, issued) index, migrations/…_110)
  // and whether a renewal request is open. The sites' columns are all in the landlord's index, so
  // a landlord with thousands of sites reads no site row.
  const openRequest = knex('renewal_requests as r').select(knex.raw('1')).whereRaw('r.site_id = s.id').andWhereRaw('r.organisation_id = s.organisation_id').andWhere('r.status', 'open');
  const q = knex('sites as s')
    .where('s.organisation_id', audience.organisationId)
    .select(
      's.id', 's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode',
      knex.raw('case when exists ? then 1 else 0 end as renewal_requested', [openRequest]),
      'c.id as certificate_id', 'c.number_text', 'c.issued_on', 'c.expires_on', 'c.overall_verdict',
      // A certificate's frozen content can be large: it is read only when it can hold an open
      // finding (LIKE is a first sieve; the pattern below decides).
      knex.raw(`case when c.content_json like '%"service"%' or c.content_json like '%"danger"%' then c.content_json end as content_json`),
    )
    .orderBy('s.address_line1')
    .orderBy('s.id');
  const latest = (alias: string) =>
    knex(`certificates as ${alias}`)
      .whereRaw(`${alias}.organisation_id = s.organisation_id`)
      .andWhereRaw(`${alias}.site_id = s.id`)
      .whereNull(`${alias}.voided_at`)
      .orderBy([{ column: `${alias}.issued_at`, order: 'desc' }, { column: `${alias}.id`, order: 'desc' }])
      .limit(1);
  if (knex.client.config.client === 'pg') {
    // PostgreSQL: a lateral join reads that one newest row per site.
    // (Knex takes a query as a binding here, as it does in raw(); its types only list values.)
    const newest = latest('c').select('c.id', 'c.number_text', 'c.issued_on', 'c.expires_on', 'c.overall_verdict', 'c.content_json');
    q.joinRaw('left join lateral ? as c on true', [newest as unknown as Knex.Value]);
  } else {
    // SQLite has no lateral join: the newest row's id, then the row by its key.
    q.leftJoin('certificates as c', (j) => j.on('c.id', '=', knex.raw('?', [latest('c2').select('c2.id')])));
  }
  if (audience.landlordId) q.andWhere('s.landlord_id', audience.landlordId);
  if (audience.homeownerId) q.andWhere('s.homeowner_id', audience.homeownerId);
  if (siteId) q.andWhere('s.id', siteId);
  const rows = await selectArrays(knex, q);
  return rows.map(([id, reference, line1, line2, town, postcode, renewalRequested, certificateId, numberText, issuedOn, expires, verdict, content]) => {
    const expiresOn = certificateId ? (toDateOnly(expires) ?? '') : '';
    return {
      id: String(id),
      reference: String(reference),
      address: line1 && line2 ? `${line1}, ${line2}` : String(line1 || line2 || ''),
      town: String(town),
      postcode: String(postcode),
      current: certificateId
        ? {
            id: String(certificateId),
            numberText: String(numberText),
            issuedOn: toDateOnly(issuedOn) ?? '',
            expiresOn,
            status: certificateStatus({ voidedAt: null, expiresOn, today }),
            overallVerdict: verdict as VerdictLevel,
          }
        : null,
      openFindings: typeof content === 'string' && /"(service|danger)"/.test(content) ? openFindingsOf(String(numberText), parse<CertificateContent>(content, {} as CertificateContent)) : [],
      renewalRequested: Number(renewalRequested) === 1,
    };
  });
}

/** Whether the visit is in the organisation and assigned to this engineer. */
export async function isVisitAssignedTo(input: { organisationId: string; visitId: string; engineerId: string }): Promise<boolean> {
  return Boolean(await db()('visits').where({ id: input.visitId, organisation_id: input.organisationId, engineer_id: input.engineerId }).first('id'));
}
