// POST /api/v1/sync: exactly-once application of the field outbox, per-item results, scoping to
// the engineer's own visits, range checks, conflicts with office edits, and the verdict of record
// recomputed on submit.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { freshDatabase } from '../../support/db';
import { noParams, postJson, signInAs } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds } from '@/seeds/demo-support';
import * as syncRoute from '@/app/api/v1/sync/route';
import { ENGINEER_DECLARATION } from '@/lib/field';
import type { MutationResult } from '@/lib/validations/sync';
import { applianceAt, as, mutation, office, priya, reading, tomasz, visits } from './helpers';
// Raw rows: SQLite gives timestamps as text, PostgreSQL as Date; toIso reads both.
import { toIso } from '@/db/rows';

type Body = { results: MutationResult[] };

async function sync(mutations: unknown[]): Promise<{ status: number; body: Body }> {
  const res = await syncRoute.POST(postJson('/api/v1/sync', { mutations }), noParams);
  return { status: res.status, body: (await res.json()) as Body };
}

const VISIT = visits.priyaToday;
const HEATER = applianceAt(visits.priyaSite, 0); // open-flued gas fire, natural gas
const FURNACE = applianceAt(visits.priyaSite, 1);
const BOILER = applianceAt(visits.priyaSite, 2); // open-flued natural-gas boiler

async function readingsOf(applianceId: string, visitId = VISIT) {
  return db()('readings as r').join('inspections as i', 'i.id', 'r.inspection_id').where({ 'i.appliance_id': applianceId, 'i.visit_id': visitId }).select('r.*');
}

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);
beforeEach(() => as(priya));

describe('who may sync', () => {
  it('401 when signed out, 403 for the office', async () => {
    signInAs(null);
    expect((await sync([reading(VISIT, HEATER, {})])).status).toBe(401);
    as(office);
    const res = await sync([reading(VISIT, HEATER, {})]);
    expect(res.status).toBe(403);
  });

  it("another engineer's visit, another organisation's or a made-up one: 404 per item, nothing written", async () => {
    const before = (await db()('readings').count<{ n: number }[]>({ n: '*' }))[0].n;
    const { status, body } = await sync([
      reading(visits.tomaszToday, applianceAt(10, 0), {}),
      reading(randomUUID(), HEATER, {}),
      mutation('roomCheck.save', visits.tomaszToday, { roomCheckId: randomUUID(), room: 'Hall', coPpm: 1, minutes: 5, takenAt: new Date().toISOString() }),
    ]);
    expect(status).toBe(200);
    expect(body.results.map((r) => r.status)).toEqual(['rejected', 'rejected', 'rejected']);
    expect(body.results.map((r) => (r.status === 'rejected' ? r.httpStatus : 0))).toEqual([404, 404, 404]);
    expect(Number((await db()('readings').count<{ n: number }[]>({ n: '*' }))[0].n)).toBe(Number(before));
    expect(await db()('room_checks').where({ visit_id: visits.tomaszToday }).first()).toBeUndefined();
  });

  it('an appliance of another site is refused, naming the field', async () => {
    const { body } = await sync([reading(VISIT, applianceAt(10, 0), {})]);
    expect(body.results[0]).toMatchObject({ status: 'rejected', httpStatus: 422, fields: { applianceId: expect.any(String) } });
  });
});

describe('exactly once', () => {
  it('the same batch twice is applied once', async () => {
    const batch = [
      mutation('visit.arrive', VISIT, { arrivedAt: new Date().toISOString() }),
      reading(VISIT, HEATER, { coPpm: 20, co2Pct: 6.1, o2Pct: 10.1 }),
      reading(VISIT, HEATER, { coPpm: 12, co2Pct: 5.0, o2Pct: 12 }, 'low_fire'),
      mutation('roomCheck.save', VISIT, { roomCheckId: randomUUID(), room: 'Living room', coPpm: 0, minutes: 15, takenAt: new Date().toISOString() }),
    ];
    const first = await sync(batch);
    expect(first.body.results.map((r) => r.status)).toEqual(['applied', 'applied', 'applied', 'applied']);
    const second = await sync(batch);
    expect(second.body.results.map((r) => r.status)).toEqual(['duplicate', 'duplicate', 'duplicate', 'duplicate']);
    expect(second.body.results.map((r) => r.id)).toEqual(batch.map((m) => m.id));
    expect(await readingsOf(HEATER)).toHaveLength(2);
    expect(await db()('room_checks').where({ visit_id: VISIT })).toHaveLength(1);
    expect(await db()('sync_mutations').whereIn('id', batch.map((m) => m.id))).toHaveLength(4);
    const visit = await db()('visits').where({ id: VISIT }).first();
    expect(visit.status).toBe('on_site');
  });

  it('a connection dropped mid-batch: the resend applies only what had not committed', async () => {
    const batch = [reading(VISIT, FURNACE, { coPpm: 30 }), reading(VISIT, FURNACE, { coPpm: 25 }, 'low_fire'), reading(VISIT, FURNACE, { coPpm: 28 }, 'as_left')];
    // The first request reached the server with only the first item before the line dropped.
    await sync(batch.slice(0, 1));
    const resend = await sync(batch);
    expect(resend.body.results.map((r) => r.status)).toEqual(['duplicate', 'applied', 'applied']);
    const rows = await readingsOf(FURNACE);
    expect(rows.map((r) => r.test_point).sort()).toEqual(['as_left', 'high_fire', 'low_fire']);
  });

  it('a mutation id used by another engineer is refused, not treated as theirs', async () => {
    const m = mutation('visit.arrive', visits.tomaszToday, { arrivedAt: new Date().toISOString() });
    as(tomasz);
    expect((await sync([m])).body.results[0].status).toBe('applied');
    as(priya);
    const { body } = await sync([{ ...m, visitId: VISIT }]);
    expect(body.results[0]).toMatchObject({ status: 'rejected', httpStatus: 409 });
  });
});

describe('validation per item', () => {
  it('a batch with one bad item applies the rest and reports the bad one with its field', async () => {
    const good1 = reading(VISIT, BOILER, { coPpm: 35, co2Pct: 9.1, o2Pct: 4.6 });
    const bad = reading(VISIT, BOILER, { coPpm: 35, co2Pct: 9.1, o2Pct: 25 }, 'low_fire');
    const good2 = mutation('tightness.save', VISIT, { tightnessId: randomUUID(), startMbar: 20, endMbar: 19.8, durationMin: 2, takenAt: new Date().toISOString() });
    const { body } = await sync([good1, bad, good2]);
    expect(body.results.map((r) => r.status)).toEqual(['applied', 'rejected', 'applied']);
    const rejected = body.results[1];
    expect(rejected).toMatchObject({ id: bad.id, status: 'rejected', httpStatus: 422, code: 'invalid_input' });
    expect(rejected.status === 'rejected' && rejected.fields).toEqual({ 'values.o2Pct': 'O2 must be from 0 to below 20.9 %' });
    expect((await readingsOf(BOILER)).map((r) => r.id)).toEqual([good1.payload.readingId]);
    expect(await db()('tightness_tests').where({ visit_id: VISIT })).toHaveLength(1);
  });

  // Ranges are those lib/combustion accepts (lib/combustion/guards.ts): O2 below 20.9 % (pure air
  // makes every air-free formula divide by zero), CO2 0.01–30 %, temperatures −60–1500 °C / −76–2732 °F.
  it.each([
    ['negative CO', { coPpm: -5 }, 'values.coPpm'],
    ['O2 of pure air', { o2Pct: 20.9 }, 'values.o2Pct'],
    ['CO2 above any fuel', { co2Pct: 31 }, 'values.co2Pct'],
    ['flue at 2000 °C', { flueTemp: 2000 }, 'values.flueTemp'],
    ['flue at 3000 °F', { flueTemp: 3000, tempUnit: 'F' as const }, 'values.flueTemp'],
    ['CO given as text', { coPpm: 'lots' as unknown as number }, 'values.coPpm'],
  ])('%s → 422 for that item, naming %s', async (_name, values, field) => {
    const m = reading(VISIT, HEATER, values, 'as_left');
    const { body } = await sync([m]);
    expect(body.results[0]).toMatchObject({ status: 'rejected', httpStatus: 422 });
    const r = body.results[0];
    expect(r.status === 'rejected' && Object.keys(r.fields ?? {})).toEqual([field]);
    expect(await db()('readings').where({ id: m.payload.readingId }).first()).toBeUndefined();
  });

  it('a reading in °F is kept in °C', async () => {
    const m = reading(VISIT, HEATER, { flueTemp: 356, airTemp: 64.4, tempUnit: 'F' }, 'as_left');
    expect((await sync([m])).body.results[0].status).toBe('applied');
    const row = await db()('readings').where({ id: m.payload.readingId }).first();
    expect(row.flue_temp_c).toBeCloseTo(180, 6);
    expect(row.air_temp_c).toBeCloseTo(18, 6);
    expect(row.temp_unit).toBe('F');
  });

  it('a malformed item (no kind, bad id) is reported without stopping the batch', async () => {
    const good = mutation('roomCheck.save', VISIT, { roomCheckId: randomUUID(), room: 'Kitchen', coPpm: 2, minutes: 10, takenAt: new Date().toISOString() });
    const { body } = await sync([{ id: 'not-an-id', visitId: VISIT }, good]);
    expect(body.results[0]).toMatchObject({ id: 'not-an-id', status: 'rejected', httpStatus: 422 });
    expect(body.results[1].status).toBe('applied');
  });

  it('a body that is not a batch is a 422 for the request', async () => {
    const res = await syncRoute.POST(postJson('/api/v1/sync', { mutations: [] }), noParams);
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields.mutations).toBeDefined();
  });
});

describe('readings are never overwritten', () => {
  it('a correction adds a row that supersedes the old one; the old one stays', async () => {
    const first = reading(VISIT, FURNACE, { coPpm: 300, co2Pct: 9 }, 'high_fire');
    const fix = reading(VISIT, FURNACE, { coPpm: 30, co2Pct: 9 }, 'high_fire', { replacesId: first.payload.readingId });
    expect((await sync([first, fix])).body.results.map((r) => r.status)).toEqual(['applied', 'applied']);
    const rows = await db()('readings').whereIn('id', [first.payload.readingId, fix.payload.readingId]);
    expect(rows).toHaveLength(2);
    expect(rows.find((r) => r.id === fix.payload.readingId).replaces_id).toBe(first.payload.readingId);
    expect(rows.find((r) => r.id === first.payload.readingId).co_ppm).toBe(300);
  });

  it('when the office changed the appliance meanwhile, both versions are kept and the conflict is flagged', async () => {
    const appliance = await db()('appliances').where({ id: BOILER }).first();
    const seenAt = toIso(appliance.updated_at)!;
    // The office corrects the model while the engineer is offline.
    await db()('appliances').where({ id: BOILER }).update({ model: 'Floor 50S', updated_at: new Date(Date.now() + 1000).toISOString() });
    const details = {
      category: 'boiler' as const,
      fuel: 'natural-gas' as const,
      flueType: 'open_flue' as const,
      location: 'Utility room',
      make: 'Brightholm',
      model: 'Floor 50 Mk2',
      serial: appliance.serial,
      ratedInputKw: 18,
      mfrRatioMax: null,
      mfrCoAirFreeMaxPpm: null,
      mfrCoMaxPpm: null,
    };
    const save = mutation('inspection.save', VISIT, {
      applianceId: BOILER,
      details,
      detailsConfirmed: true,
      baseUpdatedAt: seenAt,
      checklist: { visualCondition: 'pass', flueTermination: 'pass', ventilation: 'pass', operatingPressure: 'pass', safetyDevices: 'pass', coAlarm: 'pass' },
      spillage: 'pass',
      operatingPressureMbar: 20,
      meterTest: { volume: 0.05, volumeUnit: 'm3', seconds: 72, calorificValue: 39.5, cvUnit: 'MJ/m3' },
      analyserId: demoIds.analyser(0),
      analyserOverrideReason: null,
      notes: null,
      notTestedReason: null,
    });
    const r = reading(VISIT, BOILER, { coPpm: 40, co2Pct: 9.2, o2Pct: 4.4 }, 'low_fire');
    const { body } = await sync([save, r]);
    expect(body.results[0]).toMatchObject({ status: 'applied', conflict: true });
    expect(body.results[1].status).toBe('applied');
    // The office's record is untouched; the inspection keeps what the engineer tested.
    expect((await db()('appliances').where({ id: BOILER }).first()).model).toBe('Floor 50S');
    const inspection = await db()('inspections').where({ visit_id: VISIT, appliance_id: BOILER }).first();
    expect(JSON.parse(inspection.appliance_json).model).toBe('Floor 50 Mk2');
    // Meter test 0.050 m3 in 72 s at 39.5 MJ/m3 → 27.43 kW gross (reference sheet, worked example 4).
    expect(inspection.heat_input_gross_kw).toBeCloseTo(27.43, 2);
    const conflicts = await db()('sync_conflicts').where({ visit_id: VISIT, appliance_id: BOILER });
    expect(conflicts).toHaveLength(1);
    expect(conflicts[0].kind).toBe('appliance_details');
    expect(JSON.parse(conflicts[0].server_json).model).toBe('Floor 50S');
    expect(JSON.parse(conflicts[0].client_json).model).toBe('Floor 50 Mk2');
    // Saving again with the same details does not flag it twice, and the readings are all there.
    await sync([{ ...save, id: randomUUID() }]);
    expect(await db()('sync_conflicts').where({ visit_id: VISIT, appliance_id: BOILER })).toHaveLength(1);
    expect((await readingsOf(BOILER)).map((x) => x.id)).toContain(r.payload.readingId);
  });

  it('an analyser past its calibration date is recorded with the reason, once, for the office', async () => {
    const furnace = await db()('appliances').where({ id: FURNACE }).first();
    const reason = 'Calibrated unit is away for repair; bump-tested this one against test gas this morning';
    const save = () =>
      mutation('inspection.save', VISIT, {
        applianceId: FURNACE,
        details: { category: 'furnace', fuel: 'natural-gas', flueType: 'fan_assisted', location: furnace.location, make: furnace.make, model: furnace.model, serial: furnace.serial, ratedInputKw: 17, mfrRatioMax: null, mfrCoAirFreeMaxPpm: null, mfrCoMaxPpm: null },
        detailsConfirmed: true,
        baseUpdatedAt: null,
        checklist: { visualCondition: null, flueTermination: null, ventilation: null, operatingPressure: null, safetyDevices: null, coAlarm: null },
        spillage: null,
        operatingPressureMbar: null,
        meterTest: null,
        // Analyser 2 of the demo register was due 35 days ago (seeds/01-demo-core.ts).
        analyserId: demoIds.analyser(2),
        analyserOverrideReason: reason,
        notes: null,
        notTestedReason: null,
      });
    expect((await sync([save(), save()])).body.results.map((r) => r.status)).toEqual(['applied', 'applied']);
    const overrides = await db()('analyser_overrides').where({ visit_id: VISIT, analyser_id: demoIds.analyser(2) });
    expect(overrides).toHaveLength(1);
    expect(overrides[0]).toMatchObject({ reason, engineer_id: priya.id });
    expect((await db()('inspections').where({ visit_id: VISIT, appliance_id: FURNACE }).first()).analyser_override_reason).toBe(reason);
    // Back to the calibrated analyser for the rest of the visit.
    await sync([{ ...save(), payload: { ...save().payload, analyserId: demoIds.analyser(0), analyserOverrideReason: null } }]);
  });

  it('with no office change, the engineer’s edit updates the record, and a second edit is not a conflict', async () => {
    const appliance = await db()('appliances').where({ id: HEATER }).first();
    const base = toIso(appliance.updated_at)!;
    const payload = (location: string) => ({
      applianceId: HEATER,
      details: { category: 'space_heater' as const, fuel: 'natural-gas' as const, flueType: 'open_flue' as const, location, make: 'Emberley', model: 'Inset Fire 4', serial: appliance.serial, ratedInputKw: 4.2, mfrRatioMax: null, mfrCoAirFreeMaxPpm: null, mfrCoMaxPpm: null },
      detailsConfirmed: true,
      baseUpdatedAt: base,
      checklist: { visualCondition: 'pass' as const, flueTermination: 'pass' as const, ventilation: 'pass' as const, operatingPressure: null, safetyDevices: 'pass' as const, coAlarm: 'na' as const },
      spillage: 'pass' as const,
      operatingPressureMbar: null,
      meterTest: null,
      analyserId: demoIds.analyser(0),
      analyserOverrideReason: null,
      notes: null,
      notTestedReason: null,
    });
    const results = (await sync([mutation('inspection.save', VISIT, payload('Front room')), mutation('inspection.save', VISIT, payload('Front room, chimney breast'))])).body.results;
    expect(results.map((r) => r.status)).toEqual(['applied', 'applied']);
    expect(results.some((r) => r.status === 'applied' && r.conflict)).toBe(false);
    expect((await db()('appliances').where({ id: HEATER }).first()).location).toBe('Front room, chimney breast');
  });
});

describe('a run of readings in one batch', () => {
  // Exactly-once delivery by client-made ids and per-item answers: common practice, no source.
  it('answers each item on its own: a resent id, a refused reading, a visit not yours and a correction of an earlier item', async () => {
    const first = reading(VISIT, HEATER, { coPpm: 20 }, 'low_fire');
    const elsewhere = reading(VISIT, applianceAt(10, 0), { coPpm: 20 }, 'low_fire');
    const notMine = reading(visits.tomaszToday, applianceAt(10, 0), { coPpm: 20 }, 'low_fire');
    const unknownAnalyser = reading(VISIT, HEATER, { coPpm: 20 }, 'as_left', { analyserId: randomUUID() });
    const fix = reading(VISIT, HEATER, { coPpm: 21 }, 'low_fire', { replacesId: first.payload.readingId });
    const { body } = await sync([first, first, elsewhere, notMine, unknownAnalyser, fix]);
    expect(body.results.map((r) => r.status)).toEqual(['applied', 'duplicate', 'rejected', 'rejected', 'rejected', 'applied']);
    expect(body.results[2]).toMatchObject({ httpStatus: 422, fields: { applianceId: 'No such appliance at this site' } });
    expect(body.results[3]).toMatchObject({ httpStatus: 404 });
    expect(body.results[4]).toMatchObject({ httpStatus: 422, fields: { analyserId: 'No such analyser in the register' } });
    const rows = await db()('readings').whereIn('id', [first, elsewhere, notMine, unknownAnalyser, fix].map((m) => m.payload.readingId));
    expect(rows.map((r) => r.id).sort()).toEqual([first.payload.readingId, fix.payload.readingId].sort());
    expect(await db()('inspections').where({ visit_id: VISIT, appliance_id: applianceAt(10, 0) })).toHaveLength(0);
    expect((await db()('sync_mutations').whereIn('id', [first, elsewhere, notMine, unknownAnalyser, fix].map((m) => m.id))).map((r) => r.id).sort()).toEqual([first.id, fix.id].sort());
    // The same batch again: the applied ones are duplicates, the refused ones are refused again.
    const again = await sync([first, elsewhere, fix]);
    expect(again.body.results.map((r) => r.status)).toEqual(['duplicate', 'rejected', 'duplicate']);
  });
});

describe('submit', () => {
  const SUBMIT_VISIT = demoIds.visit(3, 1);

  async function saver() {
    const furnace = await db()('appliances').where({ id: FURNACE }).first();
    const save = (applianceId: string, fields: Record<string, unknown>) =>
      mutation('inspection.save', SUBMIT_VISIT, {
        applianceId,
        details: { category: 'furnace', fuel: 'natural-gas', flueType: 'fan_assisted', location: furnace.location, make: furnace.make, model: furnace.model, serial: furnace.serial, ratedInputKw: 17, mfrRatioMax: null, mfrCoAirFreeMaxPpm: null, mfrCoMaxPpm: null },
        detailsConfirmed: true,
        baseUpdatedAt: null,
        checklist: { visualCondition: null, flueTermination: null, ventilation: null, operatingPressure: null, safetyDevices: null, coAlarm: null },
        spillage: null,
        operatingPressureMbar: null,
        meterTest: null,
        analyserId: demoIds.analyser(0),
        analyserOverrideReason: null,
        notes: null,
        notTestedReason: null,
        ...fields,
      } as never);
    return save;
  }

  it('is refused until the danger is made safe and the sign-off is recorded; then the server’s verdict stands', async () => {
    const save = await saver();
    const boiler = await db()('inspections').where({ visit_id: SUBMIT_VISIT, appliance_id: BOILER }).first();
    const boilerDetails = JSON.parse(boiler.appliance_json);
    const heaterInspection = await db()('inspections').where({ visit_id: SUBMIT_VISIT, appliance_id: HEATER }).first();
    const heaterDetails = JSON.parse(heaterInspection.appliance_json);
    const setup = await sync([
      save(FURNACE, { notes: 'Fan-assisted; flue gas sampled at the test point' }),
      // A failed spillage test trips the danger level (uk-reference preset SPILLAGE_RULE: "common trade practice").
      save(BOILER, { details: boilerDetails, spillage: 'fail' }),
      save(HEATER, { details: heaterDetails, spillage: 'pass' }),
    ]);
    expect(setup.body.results.every((r) => r.status === 'applied')).toBe(true);

    // The device thinks everything is clear: wrong, and it must not decide the verdict of record.
    const submit = () => mutation('visit.submit', SUBMIT_VISIT, { clientVerdicts: { overall: 'clear', appliances: { [BOILER]: 'clear', [HEATER]: 'clear' }, installation: 'clear' } });
    const refused = (await sync([submit()])).body.results[0];
    expect(refused).toMatchObject({ status: 'rejected', httpStatus: 422 });
    expect(refused.status === 'rejected' && Object.keys(refused.fields ?? {}).sort()).toEqual([`make-safe:${BOILER}`, 'signoff']);
    expect((await db()('visits').where({ id: SUBMIT_VISIT }).first()).status).toBe('on_site');

    const png = await sharp({ create: { width: 300, height: 120, channels: 4, background: { r: 255, g: 255, b: 255, alpha: 1 } } }).png().toBuffer();
    const now = new Date().toISOString();
    const done = await sync([
      mutation('makeSafe.save', SUBMIT_VISIT, { makeSafeId: randomUUID(), applianceId: BOILER, madeSafeBy: 'isolated', occupantWarned: true, consent: 'given', occupantName: 'A. Tenant', refusalNote: null, warningNoticeLeft: true, notes: null, recordedAt: now }),
      mutation('signoff.save', SUBMIT_VISIT, { occupantName: 'A. Tenant', signaturePng: `data:image/png;base64,${png.toString('base64')}`, noSignatureReason: null, declarationAccepted: true, declarationText: ENGINEER_DECLARATION, signedAt: now }),
      submit(),
    ]);
    expect(done.body.results.map((r) => r.status)).toEqual(['applied', 'applied', 'applied']);

    const visit = await db()('visits').where({ id: SUBMIT_VISIT }).first();
    expect(visit.status).toBe('submitted');
    expect(visit.overall_verdict).toBe('danger');
    const boilerAfter = await db()('inspections').where({ visit_id: SUBMIT_VISIT, appliance_id: BOILER }).first();
    expect(boilerAfter.verdict_of_record).toBe('danger');
    expect(boilerAfter.client_verdict).toBe('clear');
    const verdict = JSON.parse(boilerAfter.verdict_json);
    expect(verdict.decidedBy.metric).toBe('spillage');
    // The snapshot names the rules used, so the verdict stays explainable after the limits change.
    const limits = JSON.parse(boilerAfter.limits_json);
    expect(limits.entries.find((e: { metric: string; testPoint: string | null }) => e.metric === 'co_co2_ratio' && e.testPoint === 'high_fire').decided.serviceAt).toBe(0.006);
    const discrepancies = await db()('verdict_discrepancies').where({ visit_id: SUBMIT_VISIT });
    expect(discrepancies.map((d) => `${d.subject}:${d.client_verdict}->${d.server_verdict}`).sort()).toEqual(['appliance:clear->danger', 'visit:clear->danger']);
    // The furnace's live readings are the correction (CO 30 ppm), not the 300 ppm it replaced.
    const furnaceAfter = await db()('inspections').where({ visit_id: SUBMIT_VISIT, appliance_id: FURNACE }).first();
    const furnaceVerdict = JSON.parse(furnaceAfter.verdict_json);
    expect(furnaceVerdict.items.filter((i: { metric: string; testPoint: string }) => i.metric === 'co_co2_ratio' && i.testPoint === 'high_fire').map((i: { value: number }) => i.value)).not.toContain(300 / 10000 / 9);
    const signoff = await db()('visit_signoffs').where({ visit_id: SUBMIT_VISIT }).first();
    const photo = await db()('photos').where({ id: signoff.signature_photo_id }).first();
    expect(photo.purpose).toBe('signature');
    expect(photo.mime).toBe('image/png');

    // Once submitted, the field can no longer change it; a resent submit is a duplicate.
    const late = await sync([reading(SUBMIT_VISIT, HEATER, {}, 'as_left')]);
    expect(late.body.results[0]).toMatchObject({ status: 'rejected', httpStatus: 409 });
  });
});
