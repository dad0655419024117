import 'server-only';
// CSV import of sites and appliances: every row is checked against the same zod schema as the
// forms, names are resolved to ids of this organisation, and each problem is reported by row and
// column. Commit writes every row in one transaction, or nothing.
import { db } from '@/db/knex';
import { createSitesBulk, siteIdsByReference, listJurisdictionOptions } from '@/db/sites';
import { createAppliancesBulk } from '@/db/appliances';
import type { Actor } from '@/db/audit';
import { siteSchema, type SiteData } from '@/lib/validations/sites';
import { applianceSchema, type ApplianceData } from '@/lib/validations/appliances';
import { AppError } from '@/lib/errors';
import { parseCsv, type RowError } from './index';

export const SITE_COLUMNS = ['reference', 'address_line1', 'address_line2', 'town', 'postcode', 'jurisdiction', 'landlord_email', 'homeowner_email', 'tenant_name', 'tenant_email', 'tenant_phone', 'access_notes'] as const;
export const APPLIANCE_COLUMNS = ['site_reference', 'category', 'fuel', 'flue_type', 'location', 'make', 'model', 'serial', 'rated_input_kw', 'mfr_ratio_max', 'mfr_co_air_free_max_ppm', 'mfr_co_max_ppm'] as const;

const SITE_FIELD_TO_COLUMN: Record<string, string> = {
  reference: 'reference', addressLine1: 'address_line1', addressLine2: 'address_line2', town: 'town', postcode: 'postcode', jurisdictionId: 'jurisdiction',
  landlordId: 'landlord_email', homeownerId: 'homeowner_email', tenantName: 'tenant_name', tenantEmail: 'tenant_email', tenantPhone: 'tenant_phone', accessNotes: 'access_notes',
};
const APPLIANCE_FIELD_TO_COLUMN: Record<string, string> = {
  siteId: 'site_reference', category: 'category', fuel: 'fuel', flueType: 'flue_type', location: 'location', make: 'make', model: 'model', serial: 'serial',
  ratedInputKw: 'rated_input_kw', mfrRatioMax: 'mfr_ratio_max', mfrCoAirFreeMaxPpm: 'mfr_co_air_free_max_ppm', mfrCoMaxPpm: 'mfr_co_max_ppm',
};

export type ImportPreview<T> = { kind: 'sites' | 'appliances'; total: number; valid: number; errors: RowError[]; rows: Array<{ row: number; data: T | null }> };

const MAX_ROWS = 5000;

function headerErrors(headers: string[], expected: readonly string[], required: readonly string[]): RowError[] {
  const errors: RowError[] = [];
  for (const c of required) if (!headers.includes(c)) errors.push({ row: 1, column: c, message: `Missing column "${c}"` });
  for (const h of headers) if (!expected.includes(h)) errors.push({ row: 1, column: h, message: `Unknown column "${h}"; expected ${expected.join(', ')}` });
  return errors;
}

// Row numbers count the header as row 1, as a spreadsheet shows them.
export async function previewSites(organisationId: string, text: string): Promise<ImportPreview<SiteData>> {
  const { headers, rows } = parseCsv(text);
  if (rows.length > MAX_ROWS) throw new AppError('payload_too_large', `At most ${MAX_ROWS} rows per import.`);
  const errors = headerErrors(headers, SITE_COLUMNS, ['reference', 'address_line1', 'town', 'postcode', 'jurisdiction']);
  if (errors.length) return { kind: 'sites', total: rows.length, valid: 0, errors, rows: [] };
  const jurisdictions = new Map((await listJurisdictionOptions(organisationId)).map((j) => [j.name.toLowerCase(), j.id]));
  const customers = await db()('users').where({ organisation_id: organisationId }).whereIn('role', ['landlord', 'homeowner']).select('id', 'email', 'role');
  const byEmail = new Map(customers.map((c: Record<string, unknown>) => [`${c.role}:${String(c.email).toLowerCase()}`, String(c.id)]));
  const existing = await siteIdsByReference(organisationId);
  const seen = new Map<string, number>();
  const out: ImportPreview<SiteData>['rows'] = [];
  rows.forEach((r, i) => {
    const row = i + 2;
    const rowErrors: RowError[] = [];
    const lookup = (column: string, role: 'landlord' | 'homeowner') => {
      const email = (r[column] ?? '').toLowerCase();
      if (!email) return '';
      const id = byEmail.get(`${role}:${email}`);
      if (!id) rowErrors.push({ row, column, message: `No ${role} with e-mail ${email}` });
      return id ?? '';
    };
    const jurisdictionName = (r.jurisdiction ?? '').toLowerCase();
    const jurisdictionId = jurisdictions.get(jurisdictionName);
    if (jurisdictionName && !jurisdictionId) rowErrors.push({ row, column: 'jurisdiction', message: `No jurisdiction named "${r.jurisdiction}"` });
    const candidate = {
      reference: r.reference ?? '', addressLine1: r.address_line1 ?? '', addressLine2: r.address_line2 ?? '', town: r.town ?? '', postcode: r.postcode ?? '',
      jurisdictionId: jurisdictionId ?? (jurisdictionName ? '00000000-0000-4000-8000-000000000000' : ''),
      landlordId: lookup('landlord_email', 'landlord'), homeownerId: lookup('homeowner_email', 'homeowner'),
      tenantName: r.tenant_name ?? '', tenantEmail: r.tenant_email ?? '', tenantPhone: r.tenant_phone ?? '', accessNotes: r.access_notes ?? '',
    };
    const parsed = siteSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = SITE_FIELD_TO_COLUMN[String(issue.path[0])] ?? String(issue.path[0]);
        // A lookup failure already said what is wrong with that column.
        if (!rowErrors.some((e) => e.column === column)) rowErrors.push({ row, column, message: issue.message });
      }
    }
    const ref = (r.reference ?? '').toLowerCase();
    if (ref && existing.has(ref)) rowErrors.push({ row, column: 'reference', message: `Reference ${r.reference} is already used by a site` });
    if (ref && seen.has(ref)) rowErrors.push({ row, column: 'reference', message: `Reference ${r.reference} repeats row ${seen.get(ref)}` });
    if (ref && !seen.has(ref)) seen.set(ref, row);
    errors.push(...rowErrors);
    out.push({ row, data: rowErrors.length === 0 && parsed.success ? parsed.data : null });
  });
  return { kind: 'sites', total: rows.length, valid: out.filter((r) => r.data).length, errors, rows: out };
}

export async function previewAppliances(organisationId: string, text: string): Promise<ImportPreview<ApplianceData>> {
  const { headers, rows } = parseCsv(text);
  if (rows.length > MAX_ROWS) throw new AppError('payload_too_large', `At most ${MAX_ROWS} rows per import.`);
  const errors = headerErrors(headers, APPLIANCE_COLUMNS, ['site_reference', 'category', 'fuel', 'flue_type', 'location']);
  if (errors.length) return { kind: 'appliances', total: rows.length, valid: 0, errors, rows: [] };
  const sites = await siteIdsByReference(organisationId);
  const out: ImportPreview<ApplianceData>['rows'] = [];
  rows.forEach((r, i) => {
    const row = i + 2;
    const rowErrors: RowError[] = [];
    const siteId = sites.get((r.site_reference ?? '').toLowerCase());
    if (r.site_reference && !siteId) rowErrors.push({ row, column: 'site_reference', message: `No site with reference ${r.site_reference}` });
    const parsed = applianceSchema.safeParse({
      siteId: siteId ?? (r.site_reference ? '00000000-0000-4000-8000-000000000000' : ''), category: r.category, fuel: r.fuel, flueType: r.flue_type, location: r.location ?? '',
      make: r.make ?? '', model: r.model ?? '', serial: r.serial ?? '', ratedInputKw: r.rated_input_kw ?? '', mfrRatioMax: r.mfr_ratio_max ?? '', mfrCoAirFreeMaxPpm: r.mfr_co_air_free_max_ppm ?? '', mfrCoMaxPpm: r.mfr_co_max_ppm ?? '',
    });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = APPLIANCE_FIELD_TO_COLUMN[String(issue.path[0])] ?? String(issue.path[0]);
        if (!rowErrors.some((e) => e.column === column)) rowErrors.push({ row, column, message: issue.message });
      }
    }
    errors.push(...rowErrors);
    out.push({ row, data: rowErrors.length === 0 && parsed.success ? parsed.data : null });
  });
  return { kind: 'appliances', total: rows.length, valid: out.filter((r) => r.data).length, errors, rows: out };
}

/** Re-checks the file and writes every row in one transaction; any error and nothing is written. */
export async function commitImport(actor: Actor, kind: 'sites' | 'appliances', text: string): Promise<{ created: number; errors: RowError[] }> {
  const preview = kind === 'sites' ? await previewSites(actor.organisationId, text) : await previewAppliances(actor.organisationId, text);
  if (preview.errors.length || preview.total === 0) return { created: 0, errors: preview.errors.length ? preview.errors : [{ row: 1, column: '', message: 'The file has no rows' }] };
  const data = preview.rows.map((r) => r.data!);
  const ids = await db().transaction(async (trx) =>
    kind === 'sites' ? createSitesBulk(actor, data as SiteData[], trx) : createAppliancesBulk(actor, data as ApplianceData[], trx),
  );
  return { created: ids.length, errors: [] };
}

const MAX_CSV_BYTES = 2_000_000;

/** Reads a CSV upload: raw text/csv, or JSON { csv }. 413 when too large. */
export async function readCsvBody(req: Request): Promise<string> {
  if (Number(req.headers.get('content-length') ?? '0') > MAX_CSV_BYTES) throw new AppError('payload_too_large', 'The file is too large (2 MB at most).');
  const text = await req.text();
  if (text.length > MAX_CSV_BYTES) throw new AppError('payload_too_large', 'The file is too large (2 MB at most).');
  if ((req.headers.get('content-type') ?? '').includes('application/json')) {
    try {
      const body = JSON.parse(text) as { csv?: unknown };
      if (typeof body.csv === 'string') return body.csv;
    } catch {
      // fall through
    }
    throw new AppError('bad_request', 'Send the file as text/csv, or JSON with a "csv" string.');
  }
  return text;
}
