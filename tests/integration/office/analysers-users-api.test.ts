// Analyser register (with overrides) and staff management (invite → set password, role change,
// deactivation ending sessions), plus the audit log search.
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { resetEnvCache } from '@/lib/env';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { startMailFake, type MailFake } from '../../../scripts/fakes/mail-fake';
import * as analysersRoute from '@/app/api/v1/analysers/route';
import * as analyserRoute from '@/app/api/v1/analysers/[id]/route';
import * as overridesRoute from '@/app/api/v1/analysers/overrides/route';
import * as usersRoute from '@/app/api/v1/users/route';
import * as userRoute from '@/app/api/v1/users/[id]/route';
import * as setPasswordRoute from '@/app/api/v1/users/set-password/route';
import * as auditRoute from '@/app/api/v1/audit/route';
import * as meRoute from '@/app/api/v1/me/route';
import { verifyPassword } from '@/lib/auth/password';

const office = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org !== 'other')!;
const otherOffice = DEMO_ACCOUNTS.find((a) => a.role === 'office' && a.org === 'other')!;
const [priya, tomasz] = DEMO_ACCOUNTS.filter((a) => a.role === 'engineer');
const asOffice = () => signInAs({ id: office.id, role: 'office', organisationId: demoIds.org, name: office.name });
const asOther = () => signInAs({ id: otherOffice.id, role: 'office', organisationId: demoIds.otherOrg });
const patchJson = (body: unknown) => new Request('http://localhost:3000/x', { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

let fake: MailFake;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hm-users-'));

beforeAll(async () => {
  fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir, log: () => {} });
  process.env.SMTP_PORT = String(fake.smtpPort);
  process.env.SMTP_HOST = '127.0.0.1';
  resetEnvCache();
  await freshDatabase({ seed: true });
});
afterAll(async () => {
  await closeDb();
  await fake.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('analysers', () => {
  it('lists with calibration state, sorted by due date; filters overdue', async () => {
    asOffice();
    const body = await (await analysersRoute.GET(get('/api/v1/analysers?sort=due'), noParams)).json();
    expect(body.items.map((a: { status: { state: string } }) => a.status.state)).toEqual(['overdue', 'due_soon', 'ok']);
    const overdue = await (await analysersRoute.GET(get('/api/v1/analysers?state=overdue'), noParams)).json();
    expect(overdue.items.map((a: { serial: string }) => a.serial)).toEqual(['FGA-11930']);
  });

  it('validates, refuses a duplicate serial, and scopes by organisation', async () => {
    asOffice();
    const bad = await analysersRoute.POST(postJson('/x', { serial: '', make: 'Q', model: 'M', calibratedOn: '2026-05-01', calibrationDue: '2026-04-01' }), noParams);
    expect(bad.status).toBe(422);
    expect(Object.keys((await bad.json()).error.fields).sort()).toEqual(['calibrationDue', 'serial']);
    const dup = await analysersRoute.POST(postJson('/x', { serial: 'FGA-20871', make: 'Q', model: 'M', calibratedOn: '2026-05-01', calibrationDue: '2027-05-01' }), noParams);
    expect(dup.status).toBe(409);
    asOther();
    expect((await analyserRoute.GET(get('/x'), params({ id: demoIds.analyser(0) }))).status).toBe(404);
    expect((await analyserRoute.PATCH(patchJson({ serial: 'X', make: 'Q', model: 'M', calibratedOn: '2026-05-01', calibrationDue: '2027-05-01' }), params({ id: demoIds.analyser(0) }))).status).toBe(404);
  });

  it('an engineer using an overdue analyser must give a reason, which the office sees', async () => {
    signInAs({ id: priya.id, role: 'engineer', organisationId: demoIds.org });
    const short = await overridesRoute.POST(postJson('/x', { analyserId: demoIds.analyser(2), reason: 'needed' }), noParams);
    expect(short.status).toBe(422);
    const inDate = await overridesRoute.POST(postJson('/x', { analyserId: demoIds.analyser(0), reason: 'No reason needed for this one' }), noParams);
    expect(inDate.status).toBe(409);
    const ok = await overridesRoute.POST(postJson('/x', { analyserId: demoIds.analyser(2), visitId: demoIds.visit(0, 0), reason: 'My own analyser failed its self-test this morning' }), noParams);
    expect(ok.status).toBe(201);
    asOffice();
    const list = await (await overridesRoute.GET(get(`/api/v1/analysers/overrides?visitId=${demoIds.visit(0, 0)}`), noParams)).json();
    expect(list.overrides[0]).toMatchObject({ serial: 'FGA-11930', engineerName: priya.name, reason: 'My own analyser failed its self-test this morning' });
  });
});

describe('staff', () => {
  it('invites by e-mail; the link sets a password once', async () => {
    asOffice();
    const res = await usersRoute.POST(postJson('/x', { name: 'Rosa Quill', email: 'rosa.quill@kilnbrook.test', role: 'engineer' }), noParams);
    expect(res.status).toBe(201);
    const list = (await (await fetch(`${fake.httpUrl}/messages?to=rosa.quill@kilnbrook.test`)).json()) as Array<{ id: string }>;
    expect(list).toHaveLength(1);
    const mail = (await (await fetch(`${fake.httpUrl}/messages/${list[0].id}`)).json()) as { links: string[] };
    const link = mail.links.find((l) => l.includes('/set-password?token='))!;
    const token = new URL(link).searchParams.get('token')!;
    const mismatch = await setPasswordRoute.POST(postJson('/x', { token, password: 'long-enough-pass', confirm: 'other-pass-here' }));
    expect(mismatch.status).toBe(422);
    const done = await setPasswordRoute.POST(postJson('/x', { token, password: 'long-enough-pass', confirm: 'long-enough-pass' }));
    expect(done.status).toBe(200);
    const row = await db()('users').where({ email: 'rosa.quill@kilnbrook.test' }).first();
    expect(await verifyPassword('long-enough-pass', row.password_hash)).toBe(true);
    const again = await setPasswordRoute.POST(postJson('/x', { token, password: 'another-long-one', confirm: 'another-long-one' }));
    expect(again.status).toBe(404);
  });

  it('deactivation ends the session at once and is audited; role changes too', async () => {
    signInAs({ id: tomasz.id, role: 'engineer', organisationId: demoIds.org });
    expect((await meRoute.GET(get('/x'), noParams)).status).toBe(200);
    asOffice();
    const res = await userRoute.PATCH(patchJson({ active: false }), params({ id: tomasz.id }));
    expect((await res.json()).user.active).toBe(false);
    const row = await db()('users').where({ id: tomasz.id }).first();
    expect(row.sessions_valid_after).toBeTruthy();
    signInAs({ id: tomasz.id, role: 'engineer', organisationId: demoIds.org });
    expect((await meRoute.GET(get('/x'), noParams)).status).toBe(401);
    asOffice();
    const audit = await (await auditRoute.GET(get(`/api/v1/audit?entity=user&entityId=${tomasz.id}`), noParams)).json();
    expect(audit.items[0]).toMatchObject({ action: 'deactivate', actorId: office.id, before: { active: true }, after: { active: false } });
  });

  it('cannot change itself, customers, or another organisation’s users', async () => {
    asOffice();
    expect((await userRoute.PATCH(patchJson({ role: 'engineer' }), params({ id: office.id }))).status).toBe(409);
    expect((await userRoute.PATCH(patchJson({ active: false }), params({ id: DEMO_ACCOUNTS.find((a) => a.role === 'landlord')!.id }))).status).toBe(409);
    expect((await userRoute.PATCH(patchJson({ role: 'admin' }), params({ id: priya.id }))).status).toBe(422);
    asOther();
    expect((await userRoute.PATCH(patchJson({ active: false }), params({ id: priya.id }))).status).toBe(404);
    expect((await db()('users').where({ id: priya.id }).first()).active).toBeTruthy();
  });

  it('lists users paged and sorted; the audit log searches and pages newest first', async () => {
    asOffice();
    const users = await (await usersRoute.GET(get('/api/v1/users?sort=email&dir=asc&pageSize=4'), noParams)).json();
    const emails = users.items.map((u: { email: string }) => u.email);
    expect(emails).toEqual([...emails].sort());
    expect(users.items).toHaveLength(4);
    expect(users.items.some((u: { email: string }) => u.email.endsWith('dunmere.test'))).toBe(false);
    const found = await (await auditRoute.GET(get('/api/v1/audit?q=rosa&dir=desc'), noParams)).json();
    expect(found.items.some((a: { summary: string }) => a.summary.includes('Rosa Quill'))).toBe(true);
    const all = await (await auditRoute.GET(get('/api/v1/audit?dir=desc&pageSize=2'), noParams)).json();
    expect(all.items[0].at >= all.items[1].at).toBe(true);
    asOther();
    const theirs = await (await auditRoute.GET(get('/api/v1/audit?q=rosa'), noParams)).json();
    expect(theirs.total).toBe(0);
    expect((await auditRoute.GET(get('/api/v1/audit?entity=secrets'), noParams)).status).toBe(400);
  });
});
