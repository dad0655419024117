// lib/insight ratioTrend: the "getting worse" flag. Invented figures; the 0.008 service limit is
// BS 7967 clause 12 for boilers (from memory, via the reference sheet).
import { describe, expect, it } from 'vitest';
import { ratioTrend, type RatioSample } from '@/lib/insight';

const s = (date: string, ratio: number | null, serviceLimit: number | null = 0.008): RatioSample => ({ date, ratio, serviceLimit });

describe('ratioTrend', () => {
  it('flags a ratio that rose at each of the last three inspections, even far below the limit', () => {
    const t = ratioTrend([s('2023-05-01', 0.0005), s('2024-05-01', 0.0009), s('2025-05-01', 0.0015)]);
    expect(t.worsening).toBe(true);
    expect(t.reasons).toEqual(['rising']);
    expect(t.lastRatios).toEqual([0.0005, 0.0009, 0.0015]);
  });

  it('uses the last three in date order whatever order they come in', () => {
    const t = ratioTrend([s('2025-05-01', 0.0015), s('2022-05-01', 0.003), s('2024-05-01', 0.0009), s('2023-05-01', 0.0005)]);
    expect(t.reasons).toContain('rising');
  });

  it('does not flag a flat or falling pair inside the three', () => {
    expect(ratioTrend([s('2023-05-01', 0.001), s('2024-05-01', 0.001), s('2025-05-01', 0.0015)]).worsening).toBe(false);
    expect(ratioTrend([s('2023-05-01', 0.001), s('2024-05-01', 0.002), s('2025-05-01', 0.0015)]).worsening).toBe(false);
  });

  it('needs three inspections with a ratio to call it rising; those without one are skipped', () => {
    expect(ratioTrend([s('2024-05-01', 0.001), s('2025-05-01', 0.002)]).worsening).toBe(false);
    expect(ratioTrend([s('2023-05-01', 0.001), s('2023-11-01', null), s('2024-05-01', 0.0012), s('2025-05-01', 0.0014)]).reasons).toEqual(['rising']);
  });

  it('flags the latest ratio past half of its service limit, and not at or below half', () => {
    const over = ratioTrend([s('2024-05-01', 0.005), s('2025-05-01', 0.0041)]);
    expect(over.reasons).toEqual(['over_half_limit']);
    expect(over.fractionOfLimit).toBeCloseTo(0.5125, 6);
    expect(ratioTrend([s('2025-05-01', 0.004)]).worsening).toBe(false);
    // The limit in force at the latest date is the one that counts (a stricter local limit, 0.006).
    expect(ratioTrend([s('2025-05-01', 0.0035, 0.006)]).reasons).toEqual(['over_half_limit']);
  });

  it('no limit in force: only the rising test applies', () => {
    expect(ratioTrend([s('2025-05-01', 0.03, null)]).worsening).toBe(false);
  });

  it('gives both reasons together and a message naming them', () => {
    const t = ratioTrend([s('2023-05-01', 0.002), s('2024-05-01', 0.003), s('2025-05-01', 0.0045)]);
    expect(t.reasons).toEqual(['rising', 'over_half_limit']);
    expect(t.message).toMatch(/^Getting worse/);
  });

  it('no readings: not worsening, says so', () => {
    const t = ratioTrend([]);
    expect(t.worsening).toBe(false);
    expect(t.message).toBe('No ratio recorded yet.');
  });
});
