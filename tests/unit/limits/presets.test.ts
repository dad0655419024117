// Preset figures are checked against the shared reference sheet (combustion-figures.md); each
// expectation names the source the figure comes from.
import { describe, expect, it } from 'vitest';
import {
  MEMORY_NOTE,
  PRESETS,
  applyPreset,
  checkRule,
  findResolved,
  getPreset,
  judge,
  resolveLimits,
  type ApplianceKey,
  type FiguresAtTestPoint,
  type LimitPreset,
} from '../../../lib/limits';

function presetLevel(preset: LimitPreset) {
  return {
    jurisdictionId: preset.id,
    name: preset.name,
    versions: [{ profileId: preset.id, version: 1, effectiveFrom: '2020-01-01', rules: applyPreset(preset, { makeId: (i) => `${preset.id}-${i}` }) }],
  };
}

function resolveUnder(presetId: string, appliance: ApplianceKey) {
  return resolveLimits({ chain: [presetLevel(getPreset(presetId)!)], orgDefault: null, appliance, date: '2024-06-01' });
}

function reading(partial: Partial<FiguresAtTestPoint>): FiguresAtTestPoint {
  return { testPoint: 'high_fire', coPpm: 0, ratio: null, coAirFreeFromO2Ppm: null, coAirFreeFromCo2Ppm: null, flueLossPct: null, ...partial };
}

// Worked example 1 (worked from the formulas above): natural-gas boiler CO 120 ppm, CO2 8.9 %, O2 5.2 %.
const EXAMPLE_1 = reading({ coPpm: 120, ratio: 0.00135, coAirFreeFromO2Ppm: 160, coAirFreeFromCo2Ppm: 158, flueLossPct: 8.23 });
// Worked example 3 (worked from the formulas above): gas oven CO 150 ppm, O2 14.0 %, CO2 3.9 %.
const EXAMPLE_3 = reading({ coPpm: 150, ratio: 0.0038, coAirFreeFromO2Ppm: 454, coAirFreeFromCo2Ppm: 450 });

describe('presets: shape', () => {
  it('ships the North American, UK and German reference presets', () => {
    expect(PRESETS.map((p) => p.id)).toEqual(['na-reference', 'uk-reference', 'de-reference']);
  });

  it.each(PRESETS.map((p) => [p.id, p] as const))('%s: every rule is valid, cited, and flagged where from memory', (_id, preset) => {
    expect(preset.caution).toMatch(/verify|Check every figure/);
    expect(preset.rules.length).toBeGreaterThan(0);
    for (const r of preset.rules) {
      expect(checkRule({ ...r, id: 'x' }), `${r.metric} ${JSON.stringify(r.scope)}`).toEqual([]);
      expect(r.source.trim()).not.toBe('');
      if (/from memory/.test(r.source)) expect(r.note ?? '').toContain(MEMORY_NOTE);
    }
  });

  it.each(PRESETS.map((p) => [p.id, p] as const))('%s: no two rules share a metric and scope (no tie-break needed)', (_id, preset) => {
    const keys = preset.rules.map((r) => JSON.stringify([r.metric, r.scope]));
    expect(new Set(keys).size).toBe(keys.length);
  });

  it('is plain JSON', () => {
    expect(JSON.parse(JSON.stringify(PRESETS))).toEqual(PRESETS);
  });

  it('applyPreset gives fresh unique ids and lets an override replace the matching rule', () => {
    const uk = getPreset('uk-reference')!;
    const first = applyPreset(uk);
    const second = applyPreset(uk);
    expect(new Set([...first, ...second].map((r) => r.id)).size).toBe(first.length * 2);
    const override = { metric: 'room_co_ppm' as const, scope: { category: null, fuel: null, testPoint: null }, comparator: 'gte' as const, serviceAt: 5, dangerAt: 30, source: 'Town code clause 9' };
    const extra = { ...override, metric: 'tightness_drop_mbar' as const, comparator: 'gt' as const, serviceAt: null, dangerAt: 0 };
    const rules = applyPreset(uk, { overrides: [override, extra], makeId: (i) => `r${i}` });
    expect(rules).toHaveLength(uk.rules.length + 1);
    expect(rules.filter((r) => r.metric === 'room_co_ppm')).toEqual([{ ...override, id: expect.any(String), note: null }]);
    expect(rules.at(-1)).toMatchObject({ id: `r${uk.rules.length}`, metric: 'tightness_drop_mbar' });
  });
});

describe('presets: figures from the reference sheet', () => {
  it('uk-reference: worked example 1 is clear on the ratio (BS 7967 clause 12, 0.008, from memory)', () => {
    const verdict = judge({ figures: [EXAMPLE_1], resolved: resolveUnder('uk-reference', { category: 'boiler', fuel: 'natural-gas' }) });
    expect(verdict.overall).toBe('clear');
    expect(verdict.items).toEqual([expect.objectContaining({ metric: 'co_co2_ratio', level: 'clear', threshold: 0.008 })]);
    // The UK preset has no air-free, as-measured or flue-loss limit for this boiler: listed, not scored.
    expect(verdict.notJudged.map((n) => n.metric)).toEqual(['co_air_free_ppm', 'co_as_measured_ppm', 'flue_loss_pct']);
  });

  it('na-reference: worked example 1 is under the ANSI Z21.13 400 ppm maximum but over the BPI 50 ppm repair-advised level (from memory)', () => {
    const verdict = judge({ figures: [EXAMPLE_1], resolved: resolveUnder('na-reference', { category: 'boiler', fuel: 'natural-gas' }) });
    const airFree = verdict.items.find((i) => i.metric === 'co_air_free_ppm')!;
    expect(airFree).toMatchObject({ value: 160, level: 'service', threshold: 50 });
    expect(airFree.source).toContain('ANSI Z21.13');
    // BPI as-measured: 26–100 repair advised, 101–400 stop work until repaired (still service here), over 400 shut off.
    expect(verdict.items.find((i) => i.metric === 'co_as_measured_ppm')).toMatchObject({ value: 120, level: 'service', threshold: 25 });
    expect(verdict.overall).toBe('service');
  });

  it('na-reference: worked example 3 gas oven is clear under ANSI Z21.1 800 ppm; the same figure on a furnace is danger over ANSI Z21.47 400 ppm', () => {
    const oven = judge({ figures: [EXAMPLE_3], resolved: resolveUnder('na-reference', { category: 'cooker', fuel: 'natural-gas' }) });
    expect(oven.overall).toBe('clear');
    expect(oven.items).toEqual([expect.objectContaining({ metric: 'co_air_free_ppm', value: 454, airFreeRoute: 'o2', threshold: 800, thresholdKind: 'danger' })]);
    const furnace = judge({ figures: [EXAMPLE_3], resolved: resolveUnder('na-reference', { category: 'furnace', fuel: 'natural-gas' }) });
    expect(furnace.overall).toBe('danger');
    expect(furnace.decidedBy).toMatchObject({ metric: 'co_air_free_ppm', threshold: 400, thresholdKind: 'danger' });
    expect(furnace.decidedBy!.source).toContain('ANSI Z21.47');
  });

  it('na-reference: unvented heaters stop at 200 ppm air-free (ANSI Z21.11.2); water heaters carry the conflict note (ANSI Z21.10.1)', () => {
    const unvented = findResolved(resolveUnder('na-reference', { category: 'unvented_heater', fuel: 'propane' }), 'co_air_free_ppm', 'high_fire')!.decided!;
    expect(unvented).toMatchObject({ serviceAt: null, dangerAt: 200 });
    const water = findResolved(resolveUnder('na-reference', { category: 'water_heater', fuel: 'natural-gas' }), 'co_air_free_ppm', 'high_fire')!.decided!;
    expect(water).toMatchObject({ serviceAt: 50, dangerAt: 400 });
    expect(water.note).toContain('200 ppm');
  });

  it('na-reference: an oil boiler falls back to the BPI shut-off level (800 air-free, from memory), as no ANSI Z21 gas figure applies', () => {
    const oil = findResolved(resolveUnder('na-reference', { category: 'boiler', fuel: 'gas-oil' }), 'co_air_free_ppm', 'high_fire')!.decided!;
    expect(oil).toMatchObject({ serviceAt: 50, dangerAt: 800, note: MEMORY_NOTE });
  });

  it('na-reference: ambient CO over 35 ppm stops testing (NREL SWS 2.0105.1)', () => {
    const resolved = resolveUnder('na-reference', { category: 'furnace', fuel: 'natural-gas' });
    const room = (coPpm: number) => judge({ figures: [], roomChecks: [{ room: 'Basement', coPpm }], resolved }).items.find((i) => i.metric === 'room_co_ppm')!.level;
    expect([room(35), room(36)]).toEqual(['clear', 'danger']);
  });

  it('uk-reference: room CO 10 ppm or more is service, 30 or more danger (BS 7967 clause 6.2.2, from memory)', () => {
    const resolved = resolveUnder('uk-reference', { category: 'boiler', fuel: 'natural-gas' });
    const room = (coPpm: number) => judge({ figures: [], roomChecks: [{ room: 'Kitchen', coPpm }], resolved }).items.find((i) => i.metric === 'room_co_ppm')!.level;
    expect([room(9), room(10), room(29), room(30)]).toEqual(['clear', 'service', 'service', 'danger']);
  });

  it('uk-reference: gas fires get 0.020 and condensing boilers 0.0040 and 350 ppm (BS 7967 clause 12 from memory; trade body guidance)', () => {
    const fire = judge({ figures: [reading({ coPpm: 50, ratio: 0.015 })], resolved: resolveUnder('uk-reference', { category: 'space_heater', fuel: 'natural-gas' }) });
    expect(fire.overall).toBe('clear');
    const condensing = resolveUnder('uk-reference', { category: 'condensing_boiler', fuel: 'natural-gas' });
    expect(judge({ figures: [reading({ coPpm: 300, ratio: 0.004 })], resolved: condensing }).overall).toBe('clear');
    expect(judge({ figures: [reading({ coPpm: 300, ratio: 0.0045 })], resolved: condensing }).overall).toBe('service');
    expect(judge({ figures: [reading({ coPpm: 351, ratio: 0.003 })], resolved: condensing }).overall).toBe('service');
  });

  it('uk-reference: a failed spillage test is danger (common practice)', () => {
    const resolved = resolveUnder('uk-reference', { category: 'space_heater', fuel: 'natural-gas' });
    expect(judge({ figures: [reading({ coPpm: 20, ratio: 0.001 })], spillage: 'fail', resolved }).overall).toBe('danger');
  });

  it('uk-reference: a cooker has no CO limit in the preset, so its reading is unknown, never clear', () => {
    const verdict = judge({ figures: [EXAMPLE_3], resolved: resolveUnder('uk-reference', { category: 'cooker', fuel: 'natural-gas' }) });
    expect(verdict.overall).toBe('unknown');
  });

  it('de-reference: worked example 2 oil boiler 20 kW, 9.17 % loss and 49 ppm air-free, is clear (1. BImSchV §10, 11 %)', () => {
    const resolved = resolveUnder('de-reference', { category: 'boiler', fuel: 'gas-oil' });
    const verdict = judge({ figures: [reading({ coPpm: 40, coAirFreeFromO2Ppm: 49, flueLossPct: 9.17 })], resolved });
    expect(verdict.overall).toBe('clear');
    expect(verdict.items.find((i) => i.metric === 'flue_loss_pct')).toMatchObject({ threshold: 11, level: 'clear' });
    expect(judge({ figures: [reading({ coPpm: 40, coAirFreeFromO2Ppm: 49, flueLossPct: 11.5 })], resolved }).overall).toBe('service');
  });

  it('de-reference: undiluted CO 500 ppm is maintenance and above 1000 a defect (chimney-sweep practice)', () => {
    const resolved = resolveUnder('de-reference', { category: 'boiler', fuel: 'natural-gas' });
    const level = (ppm: number) => judge({ figures: [reading({ coPpm: ppm / 2, coAirFreeFromO2Ppm: ppm })], resolved }).overall;
    expect([level(499), level(500), level(999), level(1001)]).toEqual(['clear', 'service', 'service', 'danger']);
  });
});
