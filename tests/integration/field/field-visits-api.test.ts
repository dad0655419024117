// GET /api/v1/field/visits(/[id]): what an engineer's phone downloads for offline work, and only theirs;
// plus the no-access outcome recorded through the outbox.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds } from '@/seeds/demo-support';
import * as listRoute from '@/app/api/v1/field/visits/route';
import * as oneRoute from '@/app/api/v1/field/visits/[id]/route';
import * as syncRoute from '@/app/api/v1/sync/route';
import * as photosRoute from '@/app/api/v1/photos/route';
import { resolveLimits } from '@/lib/limits';
import type { FieldBundle } from '@/lib/field';
import type { MutationResult } from '@/lib/validations/sync';
import { as, mutation, office, priya, tomasz, visits } from './helpers';

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);

describe('GET /api/v1/field/visits', () => {
  it("lists the engineer's own visits with sites, appliances, history, limits and the analyser register", async () => {
    as(priya);
    const res = await listRoute.GET(get('/api/v1/field/visits'), noParams);
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    const bundle = (await res.json()) as FieldBundle;
    const mine = await db()('visits').where({ engineer_id: priya.id }).pluck('id');
    expect(bundle.visits.length).toBeGreaterThan(0);
    expect(bundle.visits.every((v) => mine.includes(v.id))).toBe(true);
    const today = bundle.visits.find((v) => v.id === visits.priyaToday)!;
    expect(today.appliances).toHaveLength(3);
    expect(today.site.reference).toBe('KB-1004');
    // Every site's limits travel with the list, so the verdict can be worked out offline.
    const context = bundle.limitContexts[today.site.jurisdictionId]!;
    expect(context.chain.map((l) => l.jurisdictionId)).toEqual([demoIds.local, demoIds.regional, demoIds.national]);
    const boiler = today.appliances.find((a) => a.details.category === 'boiler')!;
    const resolved = resolveLimits({ ...context, appliance: { category: 'boiler', fuel: boiler.details.fuel }, date: '2026-12-01' });
    // Kestrel Bay's own boiler ratio (seeds/02-demo-limits.ts v2: 0.006) beats the regional 0.008.
    expect(resolved.entries.find((e) => e.metric === 'co_co2_ratio' && e.testPoint === 'high_fire')?.decided?.serviceAt).toBe(0.006);
    expect(bundle.analysers.map((a) => a.serial).sort()).toEqual(['FGA-11930', 'FGA-20871', 'FGA-31402']);
    expect(bundle.analysers.find((a) => a.serial === 'FGA-20871')!.assignedToMe).toBe(true);
  });

  it('carries each appliance’s previous results, newest first', async () => {
    // Site KB-1014's condensing boiler has three earlier checks with a rising ratio (seeds/03-demo-field.ts).
    const visitId = randomUUID();
    const start = new Date(Date.now() + 3600_000).toISOString();
    await db()('visits').insert({ id: visitId, organisation_id: demoIds.org, site_id: demoIds.site(13), engineer_id: tomasz.id, kind: 'annual_check', status: 'booked', window_start: start, window_end: start });
    as(tomasz);
    const bundle = (await (await oneRoute.GET(get(`/api/v1/field/visits/${visitId}`), params({ id: visitId }))).json()) as FieldBundle;
    const boiler = bundle.visits[0]!.appliances.find((a) => a.id === demoIds.appliance(13, 1))!;
    expect(boiler.history).toHaveLength(3);
    const ratios = boiler.history.map((h) => h.readings.find((r) => r.testPoint === 'high_fire')!.ratio!);
    expect(ratios[0]).toBeGreaterThan(ratios[1]!);
    expect(ratios[1]).toBeGreaterThan(ratios[2]!);
  });

  it("another engineer's visit is a 404; the office cannot use the field list", async () => {
    as(priya);
    expect((await oneRoute.GET(get('/x'), params({ id: visits.tomaszToday }))).status).toBe(404);
    expect((await oneRoute.GET(get('/x'), params({ id: 'not-an-id' }))).status).toBe(404);
    as(office);
    expect((await listRoute.GET(get('/api/v1/field/visits'), noParams)).status).toBe(403);
    signInAs(null);
    expect((await listRoute.GET(get('/api/v1/field/visits'), noParams)).status).toBe(401);
  });
});

describe('no access', () => {
  it('closes the visit with time and note; a photo of the door may still follow; later changes are refused', async () => {
    as(tomasz);
    const at = new Date().toISOString();
    const sync = async (ms: unknown[]) => ((await (await syncRoute.POST(postJson('/api/v1/sync', { mutations: ms }), noParams)).json()) as { results: MutationResult[] }).results;
    const [result] = await sync([mutation('visit.noAccess', visits.tomaszToday, { at, note: 'No answer at the door or by phone; card left', photoId: null })]);
    expect(result!.status).toBe('applied');
    const visit = await db()('visits').where({ id: visits.tomaszToday }).first();
    expect(visit.status).toBe('no_access');
    expect(visit.no_access_note).toBe('No answer at the door or by phone; card left');
    expect(new Date(visit.no_access_at).toISOString()).toBe(at);

    const form = new FormData();
    const photoId = randomUUID();
    for (const [k, v] of Object.entries({ id: photoId, visitId: visits.tomaszToday, purpose: 'no_access' })) form.set(k, v);
    const jpeg = await sharp({ create: { width: 50, height: 40, channels: 3, background: '#777' } }).jpeg().toBuffer();
    form.set('file', new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' }), 'door.jpg');
    const upload = await photosRoute.POST(new Request('http://localhost:3000/api/v1/photos', { method: 'POST', body: form }), noParams);
    expect(upload.status).toBe(201);
    expect((await db()('photos').where({ id: photoId }).first()).purpose).toBe('no_access');

    const [late] = await sync([mutation('roomCheck.save', visits.tomaszToday, { roomCheckId: randomUUID(), room: 'Hall', coPpm: 0, minutes: 5, takenAt: at })]);
    expect(late).toMatchObject({ status: 'rejected', httpStatus: 409 });
  });
});
