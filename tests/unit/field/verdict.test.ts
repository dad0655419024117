// lib/field: the visit's verdicts from raw records, the same code on the phone and the server.
// Figures come from the shared reference sheet (/work/shared/reference/combustion-figures.md);
// each check names the published source of the limit it exercises.
import { describe, expect, it } from 'vitest';
import { applyPreset, getPreset, type JurisdictionLevel } from '@/lib/limits';
import {
  applianceVerdict,
  applyMutation,
  canonicalReading,
  currentReadings,
  emptyVisitRecord,
  installationVerdict,
  submitBlockers,
  visitVerdicts,
  type LimitContext,
  type RecordedReading,
} from '@/lib/field';
import type { ApplianceDetails } from '@/lib/validations/inspection';

function level(presetId: string): JurisdictionLevel {
  const preset = getPreset(presetId)!;
  let n = 0;
  return { jurisdictionId: presetId, name: preset.name, versions: [{ profileId: presetId, version: 1, effectiveFrom: '2020-01-01', rules: applyPreset(preset, { makeId: () => `r${n++}` }) }] };
}

const UK: LimitContext = { chain: [level('uk-reference')], orgDefault: null };
const DATE = '2026-03-02';

const boiler: ApplianceDetails = {
  category: 'boiler',
  fuel: 'natural-gas',
  flueType: 'open_flue',
  location: 'Kitchen',
  make: null,
  model: null,
  serial: null,
  ratedInputKw: null,
  mfrRatioMax: null,
  mfrCoAirFreeMaxPpm: null,
  mfrCoMaxPpm: null,
};

let n = 0;
function reading(values: Partial<RecordedReading>): RecordedReading {
  n += 1;
  return { id: `reading-${n}`, testPoint: 'high_fire', coPpm: 0, co2Pct: null, o2Pct: null, flueTempC: null, airTempC: null, tempUnit: 'C', analyserId: null, takenAt: `2026-03-02T10:${String(n).padStart(2, '0')}:00Z`, replacesId: null, ...values };
}

describe('appliance verdict', () => {
  it('worked example 1 (reference sheet): ratio 0.00135 is clear under the BS 7967 clause 12 boiler figure 0.008', () => {
    const result = applianceVerdict({ details: boiler, readings: [reading({ coPpm: 120, co2Pct: 8.9, o2Pct: 5.2, flueTempC: 180, airTempC: 18 })], spillage: 'pass', limits: UK, date: DATE });
    expect(result.readings[0]!.analysis!.ratio).toBeCloseTo(0.00135, 5);
    expect(result.verdict.overall).toBe('clear');
    const ratio = result.verdict.items.find((i) => i.metric === 'co_co2_ratio')!;
    expect(ratio.threshold).toBe(0.008);
    expect(ratio.source).toContain('BS 7967 clause 12');
  });

  it('a ratio above 0.008 (BS 7967 clause 12) is service, explained by the rule and its source', () => {
    // CO 800 ppm over CO2 8.9 % → 0.0899 / 10 = 0.00899 (ratio formula, BS 7967 method).
    const result = applianceVerdict({ details: boiler, readings: [reading({ coPpm: 800, co2Pct: 8.9, o2Pct: 5.2 })], spillage: null, limits: UK, date: DATE });
    expect(result.verdict.overall).toBe('service');
    expect(result.verdict.decidedBy?.explanation).toMatch(/CO\/CO2 ratio 0\.00898876.* is above the service level 0\.008/);
  });

  it('a failed spillage test is danger (uk-reference preset: common trade practice)', () => {
    const result = applianceVerdict({ details: boiler, readings: [reading({ coPpm: 20, co2Pct: 9 })], spillage: 'fail', limits: UK, date: DATE });
    expect(result.verdict.overall).toBe('danger');
    expect(result.verdict.decidedBy?.metric).toBe('spillage');
  });

  it("the maker's stricter ratio replaces the code's service level (trade body guidance: 0.0040 for condensing boilers)", () => {
    const details = { ...boiler, mfrRatioMax: 0.004 };
    const r = reading({ coPpm: 450, co2Pct: 9 }); // ratio 0.005: under 0.008, over 0.004
    expect(applianceVerdict({ details: boiler, readings: [r], spillage: null, limits: UK, date: DATE }).verdict.overall).toBe('clear');
    const strict = applianceVerdict({ details, readings: [r], spillage: null, limits: UK, date: DATE });
    expect(strict.verdict.overall).toBe('service');
    expect(strict.verdict.decidedBy?.fromManufacturer).toBe(true);
  });

  it('a superseded reading is kept but not judged', () => {
    const wrong = reading({ coPpm: 2000, co2Pct: 9 });
    const right = reading({ coPpm: 40, co2Pct: 9, replacesId: wrong.id });
    expect(currentReadings([wrong, right]).map((r) => r.id)).toEqual([right.id]);
    expect(applianceVerdict({ details: boiler, readings: [wrong, right], spillage: null, limits: UK, date: DATE }).verdict.overall).toBe('clear');
  });

  it('nothing recorded is never clear', () => {
    expect(applianceVerdict({ details: boiler, readings: [], spillage: null, limits: UK, date: DATE }).verdict.overall).toBe('unknown');
  });
});

describe('installation verdict', () => {
  it('room CO of 30 ppm is danger, 10 ppm service (BS 7967 clause 6.2.2, uk-reference preset)', () => {
    const danger = installationVerdict({ roomChecks: [{ room: 'Kitchen', coPpm: 30, minutes: 10 }], tightness: null, fuels: ['natural-gas'], limits: UK, date: DATE })!;
    expect(danger.verdict.overall).toBe('danger');
    expect(danger.verdict.items).toHaveLength(1);
    const service = installationVerdict({ roomChecks: [{ room: 'Kitchen', coPpm: 10, minutes: 10 }], tightness: null, fuels: ['natural-gas'], limits: UK, date: DATE })!;
    expect(service.verdict.overall).toBe('service');
    expect(installationVerdict({ roomChecks: [], tightness: null, fuels: [], limits: UK, date: DATE })).toBeNull();
  });

  it('the tightness drop is start minus end pressure, and with no limit configured it is not called clear', () => {
    const result = installationVerdict({ roomChecks: [], tightness: { startMbar: 20, endMbar: 18.5, durationMin: 2 }, fuels: ['natural-gas'], limits: UK, date: DATE })!;
    expect(result.tightnessDropMbar).toBe(1.5);
    // The uk-reference preset has no tightness limit (its caution says so).
    expect(result.verdict.overall).toBe('unknown');
  });
});

describe('visit verdicts and what blocks submit', () => {
  const analysers = [
    { id: 'a-ok', serial: 'FGA-1', calibrationDue: '2026-12-01' },
    { id: 'a-old', serial: 'FGA-2', calibrationDue: '2026-01-01' },
  ];

  it('a danger needs a make-safe record; an untested appliance needs a reason; an overdue analyser needs one too', () => {
    const input = {
      appliances: [
        { applianceId: 'A', details: boiler, spillage: 'fail' as const, readings: [reading({ coPpm: 20, co2Pct: 9 })], notTestedReason: null },
        { applianceId: 'B', details: { ...boiler, location: 'Loft' }, spillage: null, readings: [], notTestedReason: null },
      ],
      roomChecks: [],
      tightness: null,
      findings: [],
      makeSafe: [] as Array<{ applianceId: string | null }>,
      limits: UK,
      date: DATE,
    };
    const verdicts = visitVerdicts(input);
    expect(verdicts.overall).toBe('danger');
    expect(verdicts.makeSafe).toEqual([{ applianceId: 'A', reasons: [expect.stringContaining('Spillage test failed')], recorded: false }]);
    const blockers = submitBlockers({
      appliances: [
        { applianceId: 'A', label: 'Kitchen boiler', readings: input.appliances[0]!.readings, notTestedReason: null, analyserId: 'a-old', analyserOverrideReason: 'short' },
        { applianceId: 'B', label: 'Loft boiler', readings: [], notTestedReason: null, analyserId: null, analyserOverrideReason: null },
      ],
      analysers,
      verdicts,
      hasSignoff: false,
      date: DATE,
    });
    expect(blockers.map((b) => b.key)).toEqual(['calibration:A', 'untested:B', 'make-safe:A', 'signoff']);

    const fixed = visitVerdicts({ ...input, makeSafe: [{ applianceId: 'A' }] });
    expect(fixed.makeSafe[0]!.recorded).toBe(true);
    const none = submitBlockers({
      appliances: [
        { applianceId: 'A', label: 'Kitchen boiler', readings: input.appliances[0]!.readings, notTestedReason: null, analyserId: 'a-old', analyserOverrideReason: 'Only analyser on the van; bump-tested at the depot this morning' },
        { applianceId: 'B', label: 'Loft boiler', readings: [], notTestedReason: 'No access to the loft hatch', analyserId: null, analyserOverrideReason: null },
      ],
      analysers,
      verdicts: fixed,
      hasSignoff: true,
      date: DATE,
    });
    expect(none).toEqual([]);
  });

  it('a danger finding raises the visit to danger and asks for the installation to be made safe', () => {
    const verdicts = visitVerdicts({
      appliances: [{ applianceId: 'A', details: boiler, spillage: 'pass', readings: [reading({ coPpm: 20, co2Pct: 9 })], notTestedReason: null }],
      roomChecks: [],
      tightness: null,
      findings: [{ applianceId: null, severity: 'danger', description: 'Gas smell at the meter' }],
      makeSafe: [],
      limits: UK,
      date: DATE,
    });
    expect(verdicts.overall).toBe('danger');
    expect(verdicts.makeSafe).toEqual([{ applianceId: null, reasons: ['Finding: Gas smell at the meter'], recorded: false }]);
  });
});

describe('the device record', () => {
  it('a reading typed in °F is kept in °C (°C = (°F − 32) × 5/9)', () => {
    expect(canonicalReading({ coPpm: 10, co2Pct: null, o2Pct: null, flueTemp: 356, airTemp: 64.4, tempUnit: 'F' })).toMatchObject({ flueTempC: 180, airTempC: expect.closeTo(18, 9), tempUnit: 'F' });
  });

  it('a reading for an appliance not yet inspected starts its inspection from the details on record', () => {
    const lookup = () => ({ details: boiler, updatedAt: '2026-01-01T00:00:00.000Z' });
    const record = applyMutation(
      emptyVisitRecord('V'),
      { id: 'm1', visitId: 'V', at: '2026-03-02T10:00:00Z', kind: 'reading.record', payload: { readingId: 'r1', applianceId: 'A', testPoint: 'low_fire', values: { coPpm: 12, co2Pct: 8, o2Pct: 6, flueTemp: null, airTemp: null, tempUnit: 'C' }, analyserId: null, takenAt: '2026-03-02T10:00:00Z', replacesId: null } },
      lookup,
    );
    expect(record.arrivedAt).toBe('2026-03-02T10:00:00Z');
    expect(record.inspections.A).toMatchObject({ details: boiler, baseUpdatedAt: '2026-01-01T00:00:00.000Z' });
    expect(record.inspections.A!.readings.map((r) => r.coPpm)).toEqual([12]);
  });
});
