import 'server-only';
// Landlords and homeowners: customer accounts of an organisation (rows of users with a customer
// role). They sign in by e-mail link, so no password is ever set here.
import { db } from './knex';
import { toIso } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { escapeLike } from '@/lib/validations/list-query';
import type { CustomerData, CustomerListQuery } from '@/lib/validations/customers';
import type { Page } from './sites';

export type Customer = {
  id: string;
  role: 'landlord' | 'homeowner';
  name: string;
  email: string;
  phone: string | null;
  active: boolean;
  siteCount: number;
  updatedAt: string;
};

const SORTS: Record<CustomerListQuery['sort'], string> = { name: 'u.name', email: 'u.email', role: 'u.role', sites: 'site_count', updated: 'u.updated_at' };

function toCustomer(r: Record<string, unknown>): Customer {
  return {
    id: String(r.id),
    role: r.role as Customer['role'],
    name: String(r.name),
    email: String(r.email),
    phone: (r.phone as string | null) ?? null,
    active: r.active === true || r.active === 1,
    siteCount: Number(r.site_count ?? 0),
    updatedAt: toIso(r.updated_at) ?? '',
  };
}

function base(organisationId: string) {
  const knex = db();
  return knex('users as u')
    .where('u.organisation_id', organisationId)
    .whereIn('u.role', ['landlord', 'homeowner']);
}

function withCount(q: ReturnType<typeof base>) {
  const knex = db();
  return q.select(
    'u.id', 'u.role', 'u.name', 'u.email', 'u.phone', 'u.active', 'u.updated_at',
    knex('sites as s').count('*').whereRaw('s.landlord_id = u.id or s.homeowner_id = u.id').as('site_count'),
  );
}

export async function listCustomers(organisationId: string, query: CustomerListQuery): Promise<Page<Customer>> {
  const q = base(organisationId);
  if (query.role) q.andWhere('u.role', query.role);
  if (query.q) {
    const like = escapeLike(query.q);
    q.andWhere((w) => w.whereRaw("lower(u.name) like ? escape '\\'", [like]).orWhereRaw("lower(u.email) like ? escape '\\'", [like]));
  }
  const [{ count }] = await q.clone().count<{ count: number | string }[]>({ count: '*' });
  const rows = await withCount(q.clone())
    .orderBy(SORTS[query.sort], query.dir)
    .orderBy('u.id', 'asc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { items: rows.map(toCustomer), total: Number(count), page: query.page, pageSize: query.pageSize };
}

export async function getCustomer(organisationId: string, id: string): Promise<Customer | null> {
  const row = await withCount(base(organisationId).andWhere('u.id', id)).first();
  return row ? toCustomer(row) : null;
}

/** Options for the site form's pickers. */
export async function listCustomerOptions(organisationId: string): Promise<Array<{ id: string; name: string; role: Customer['role'] }>> {
  const rows = await base(organisationId).andWhere('u.active', true).select('u.id', 'u.name', 'u.role').orderBy('u.name');
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), name: String(r.name), role: r.role as Customer['role'] }));
}

async function emailTaken(email: string, exceptId?: string): Promise<boolean> {
  const q = db()('users').where({ email });
  if (exceptId) q.whereNot({ id: exceptId });
  return Boolean(await q.first('id'));
}

export async function createCustomer(actor: Actor, data: CustomerData): Promise<Customer> {
  // E-mail is unique across the whole service (it is the sign-in name); say so without naming the other organisation.
  if (await emailTaken(data.email)) throw new AppError('conflict', 'An account with this e-mail already exists.', { email: 'An account with this e-mail already exists.' });
  const id = newId();
  const now = new Date().toISOString();
  const row = { id, organisation_id: actor.organisationId, role: data.role, name: data.name, email: data.email, phone: data.phone, active: true, created_at: now, updated_at: now };
  await db().transaction(async (trx) => {
    await trx('users').insert(row);
    await recordAudit(trx, { actor, entity: 'customer', entityId: id, action: 'create', summary: `Added ${data.role} ${data.name} <${data.email}>`, after: { role: data.role, name: data.name, email: data.email, phone: data.phone } });
  });
  return (await getCustomer(actor.organisationId, id))!;
}

export async function updateCustomer(actor: Actor, id: string, data: CustomerData): Promise<Customer | null> {
  const before = await getCustomer(actor.organisationId, id);
  if (!before) return null;
  if (data.email !== before.email && (await emailTaken(data.email, id))) throw new AppError('conflict', 'An account with this e-mail already exists.', { email: 'An account with this e-mail already exists.' });
  await db().transaction(async (trx) => {
    await trx('users').where({ id, organisation_id: actor.organisationId }).update({ role: data.role, name: data.name, email: data.email, phone: data.phone, updated_at: new Date().toISOString() });
    await recordAudit(trx, {
      actor, entity: 'customer', entityId: id, action: 'update', summary: `Changed ${data.role} ${data.name}`,
      before: { role: before.role, name: before.name, email: before.email, phone: before.phone },
      after: { role: data.role, name: data.name, email: data.email, phone: data.phone },
    });
  });
  return getCustomer(actor.organisationId, id);
}
