import 'server-only';
// Photo records: which visit (and appliance or finding) a stored image belongs to, and who may see it.
// The image bytes live in lib/storage; only the key is kept here.
import { db } from './knex';
import { toIso } from './rows';
import { AppError } from '@/lib/errors';
import type { Role } from '@/lib/auth/roles';
import type { PhotoMeta } from '@/lib/validations/inspection';

type Row = Record<string, unknown>;

export type Photo = {
  id: string;
  visitId: string;
  purpose: string;
  applianceId: string | null;
  findingId: string | null;
  caption: string | null;
  storageKey: string;
  mime: string;
  bytes: number;
  width: number;
  height: number;
  createdAt: string;
};

function toPhoto(r: Row): Photo {
  return {
    id: String(r.id),
    visitId: String(r.visit_id),
    purpose: String(r.purpose),
    applianceId: (r.appliance_id as string | null) ?? null,
    findingId: (r.finding_id as string | null) ?? null,
    caption: (r.caption as string | null) ?? null,
    storageKey: String(r.storage_key),
    mime: String(r.mime),
    bytes: Number(r.bytes),
    width: Number(r.width),
    height: Number(r.height),
    createdAt: toIso(r.created_at) ?? '',
  };
}

// Photos may still arrive after submit (a queue drains in order, but a no-access photo can follow
// the attempt it belongs to); once certified or cancelled the visit is closed to them.
const UPLOADABLE = ['booked', 'on_site', 'submitted', 'no_access'];

/** Checks the engineer may add this photo to the visit; returns an existing photo with the same id (a resend). */
export async function checkPhotoUpload(input: { organisationId: string; engineerId: string; meta: PhotoMeta }): Promise<{ existing: Photo | null }> {
  const knex = db();
  // Looked up by id alone and checked here (scoped in SQL, SQLite may walk all of the engineer's visits).
  const found = (await knex('visits').where({ id: input.meta.visitId }).first()) as Row | undefined;
  const visit = found && found.organisation_id === input.organisationId && found.engineer_id === input.engineerId ? found : undefined;
  if (!visit) throw new AppError('not_found', 'No such visit among yours.');
  const existing = (await knex('photos').where({ id: input.meta.id }).first()) as Row | undefined;
  if (existing) {
    if (existing.visit_id !== visit.id || existing.organisation_id !== input.organisationId) throw new AppError('conflict', 'This photo id is already used.', { id: 'Already used' });
    return { existing: toPhoto(existing) };
  }
  if (!UPLOADABLE.includes(String(visit.status))) throw new AppError('conflict', 'This visit is closed to new photos.');
  if (input.meta.applianceId) {
    const appliance = await knex('appliances').where({ id: input.meta.applianceId, site_id: visit.site_id, organisation_id: input.organisationId }).first();
    if (!appliance) throw new AppError('invalid_input', 'That appliance is not at this site.', { applianceId: 'No such appliance at this site' });
  }
  return { existing: null };
}

export async function createPhoto(input: {
  organisationId: string;
  uploadedBy: string;
  meta: PhotoMeta;
  storageKey: string;
  mime: string;
  bytes: number;
  width: number;
  height: number;
  sha256: string;
}): Promise<Photo> {
  const row = {
    id: input.meta.id,
    organisation_id: input.organisationId,
    visit_id: input.meta.visitId,
    appliance_id: input.meta.applianceId,
    finding_id: input.meta.findingId,
    purpose: input.meta.purpose,
    caption: input.meta.caption,
    storage_key: input.storageKey,
    mime: input.mime,
    bytes: input.bytes,
    width: input.width,
    height: input.height,
    sha256: input.sha256,
    uploaded_by: input.uploadedBy,
    taken_at: input.meta.takenAt,
    created_at: new Date().toISOString(),
  };
  await db()('photos').insert(row);
  return toPhoto(row);
}

/** A photo the user may see: the engineer of its visit, or the office of its organisation. Otherwise null. */
export async function getPhotoForViewer(input: { id: string; user: { id: string; role: Role; organisationId: string } }): Promise<Photo | null> {
  const row = (await db()('photos as p')
    .join('visits as v', 'v.id', 'p.visit_id')
    .where({ 'p.id': input.id, 'p.organisation_id': input.user.organisationId })
    .modify((q) => {
      if (input.user.role === 'engineer') q.andWhere('v.engineer_id', input.user.id);
      else if (input.user.role !== 'office') q.whereRaw('1 = 0');
    })
    .select('p.*')
    .first()) as Row | undefined;
  return row ? toPhoto(row) : null;
}
