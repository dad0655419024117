// Builders for field mutations and the demo visits the field tests use.
import { randomUUID } from 'node:crypto';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { signInAs } from '../../support/session';
import type { MutationInput } from '@/lib/validations/sync';

export const priya = DEMO_ACCOUNTS.find((a) => a.email === 'priya.oduya@kilnbrook.test')!;
export const tomasz = DEMO_ACCOUNTS.find((a) => a.email === 'tomasz.reilly@kilnbrook.test')!;
export const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
export const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;

export function as(account: { id: string; role: 'engineer' | 'office' | 'landlord' | 'homeowner'; org?: 'demo' | 'other' }) {
  signInAs({ id: account.id, role: account.role, organisationId: account.org === 'other' ? demoIds.otherOrg : demoIds.org });
}

/** Today's first visit is Priya's at site 3 (three appliances), the second Tomasz's at site 10 (seeds/01-demo-core.ts). */
export const visits = {
  priyaToday: demoIds.visit(3, 1),
  priyaSite: 3,
  tomaszToday: demoIds.visit(10, 2),
};

export const applianceAt = (site: number, k: number) => demoIds.appliance(site, k);

type Kind = MutationInput['kind'];

export function mutation<K extends Kind>(kind: K, visitId: string, payload: Extract<MutationInput, { kind: K }>['payload']): Extract<MutationInput, { kind: K }> {
  return { id: randomUUID(), visitId, at: new Date().toISOString(), kind, payload } as Extract<MutationInput, { kind: K }>;
}

export function reading(visitId: string, applianceId: string, values: Partial<{ coPpm: number; co2Pct: number | null; o2Pct: number | null; flueTemp: number | null; airTemp: number | null; tempUnit: 'C' | 'F' }>, testPoint: 'high_fire' | 'low_fire' | 'as_left' = 'high_fire', extra: { replacesId?: string | null; analyserId?: string | null } = {}) {
  return mutation('reading.record', visitId, {
    readingId: randomUUID(),
    applianceId,
    testPoint,
    values: { coPpm: 40, co2Pct: 9, o2Pct: 4.9, flueTemp: 160, airTemp: 18, tempUnit: 'C', ...values },
    analyserId: extra.analyserId === undefined ? demoIds.analyser(0) : extra.analyserId,
    takenAt: new Date().toISOString(),
    replacesId: extra.replacesId ?? null,
  });
}
