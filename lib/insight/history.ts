// The appliance history payload: every inspection's current readings with the derived figures and
// the limits in force on each inspection's date, plus the trend flag and hints for the latest one.
// Pure and compact (rounded numbers, no explanations) so the field app can cache it with a visit.
import { analyseFlueGas, type FuelId } from '../combustion';
import {
  findResolved,
  resolveLimits,
  type ApplianceCategory,
  type JurisdictionLevel,
  type ReadingMetric,
  type TestPoint,
  type VerdictLevel,
} from '../limits';
import { diagnosticHints, type Hint } from './hints';
import { ratioTrend, type TrendFlag } from './trend';

export type HistoryReadingInput = {
  testPoint: TestPoint;
  coPpm: number;
  co2Pct: number | null;
  o2Pct: number | null;
  flueTempC: number | null;
  airTempC: number | null;
};

export type HistoryInspectionInput = {
  inspectionId: string;
  visitId: string;
  /** YYYY-MM-DD: picks the limits in force. */
  date: string;
  verdict: VerdictLevel | null;
  /** Current readings only (not those a correction replaced). */
  readings: HistoryReadingInput[];
};

export type HistoryApplianceInput = {
  id: string;
  label: string;
  category: ApplianceCategory;
  fuel: FuelId;
  manufacturer: { coCo2Ratio: number | null; coAirFreePpm: number | null };
};

export type LimitPair = { service: number | null; danger: number | null; source: string | null };

export type HistoryReading = HistoryReadingInput & { ratio: number | null; coAirFreePpm: number | null; flueLossPct: number | null };

export type HistoryPoint = {
  inspectionId: string;
  visitId: string;
  date: string;
  verdict: VerdictLevel | null;
  /** Worst (highest) across the inspection's readings; null when no reading gave the figure. */
  ratio: number | null;
  coAirFreePpm: number | null;
  flueLossPct: number | null;
  limits: { ratio: LimitPair; coAirFreePpm: LimitPair; flueLossPct: LimitPair };
  readings: HistoryReading[];
};

export type ApplianceHistory = {
  appliance: HistoryApplianceInput;
  /** Oldest first. */
  points: HistoryPoint[];
  trend: TrendFlag;
  /** Hints for the latest inspection's worst reading. */
  hints: Hint[];
};

function round(value: number | null, digits: number): number | null {
  if (value === null || !Number.isFinite(value)) return null;
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

function derive(fuel: FuelId, r: HistoryReadingInput): HistoryReading {
  try {
    const a = analyseFlueGas({
      fuel,
      coPpm: r.coPpm,
      co2Pct: r.co2Pct ?? undefined,
      o2Pct: r.o2Pct ?? undefined,
      flueTempC: r.flueTempC ?? undefined,
      airTempC: r.airTempC ?? undefined,
    });
    return {
      ...r,
      ratio: round(a.ratio, 6),
      coAirFreePpm: round(a.coAirFreeFromO2Ppm ?? a.coAirFreeFromCo2Ppm, 1),
      flueLossPct: round(a.flueLossPct, 2),
    };
  } catch {
    // A stored reading outside the analyser's plausible range still shows, without derived figures.
    return { ...r, ratio: null, coAirFreePpm: null, flueLossPct: null };
  }
}

function maxOf(values: Array<number | null>): number | null {
  const present = values.filter((v): v is number => v !== null);
  return present.length ? Math.max(...present) : null;
}

/** Strictest service and danger thresholds across the test points read (manufacturer's where stricter). */
function limitFor(input: {
  resolved: ReturnType<typeof resolveLimits>;
  metric: ReadingMetric;
  testPoints: TestPoint[];
  manufacturer: number | null;
}): LimitPair {
  let service: number | null = null;
  let danger: number | null = null;
  let source: string | null = null;
  for (const tp of input.testPoints) {
    const rule = findResolved(input.resolved, input.metric, tp)?.decided;
    if (!rule) continue;
    if (rule.serviceAt !== null && (service === null || rule.serviceAt < service)) {
      service = rule.serviceAt;
      source = rule.source;
    }
    if (rule.dangerAt !== null && (danger === null || rule.dangerAt < danger)) {
      danger = rule.dangerAt;
      source ??= rule.source;
    }
  }
  if (input.manufacturer !== null && (service === null || input.manufacturer < service)) {
    service = input.manufacturer;
    source = "manufacturer's instructions";
  }
  return { service, danger, source };
}

export function buildApplianceHistory(input: {
  appliance: HistoryApplianceInput;
  inspections: HistoryInspectionInput[];
  limitContext: { chain: JurisdictionLevel[]; orgDefault: JurisdictionLevel | null };
}): ApplianceHistory {
  const { appliance } = input;
  const key = { category: appliance.category, fuel: appliance.fuel };
  const points: HistoryPoint[] = [...input.inspections]
    .sort((a, b) => a.date.localeCompare(b.date))
    .map((inspection) => {
      const readings = inspection.readings.map((r) => derive(appliance.fuel, r));
      const testPoints: TestPoint[] = readings.length ? [...new Set(readings.map((r) => r.testPoint))] : ['high_fire'];
      const resolved = resolveLimits({ ...input.limitContext, appliance: key, date: inspection.date });
      return {
        inspectionId: inspection.inspectionId,
        visitId: inspection.visitId,
        date: inspection.date,
        verdict: inspection.verdict,
        ratio: maxOf(readings.map((r) => r.ratio)),
        coAirFreePpm: maxOf(readings.map((r) => r.coAirFreePpm)),
        flueLossPct: maxOf(readings.map((r) => r.flueLossPct)),
        limits: {
          ratio: limitFor({ resolved, metric: 'co_co2_ratio', testPoints, manufacturer: appliance.manufacturer.coCo2Ratio }),
          coAirFreePpm: limitFor({ resolved, metric: 'co_air_free_ppm', testPoints, manufacturer: appliance.manufacturer.coAirFreePpm }),
          flueLossPct: limitFor({ resolved, metric: 'flue_loss_pct', testPoints, manufacturer: null }),
        },
        readings,
      };
    });

  const trend = ratioTrend(points.map((p) => ({ date: p.date, ratio: p.ratio, serviceLimit: p.limits.ratio.service })));
  const latest = points.at(-1);
  // The worst reading by ratio (else by CO) speaks for the latest inspection.
  const worst = latest?.readings.slice().sort((a, b) => (b.ratio ?? -1) - (a.ratio ?? -1) || b.coPpm - a.coPpm)[0];
  const hints = worst
    ? diagnosticHints({ reading: { ...worst, fuel: appliance.fuel, category: appliance.category }, ratioRising: trend.reasons.includes('rising') })
    : trend.reasons.includes('rising')
      ? diagnosticHints({ reading: { fuel: appliance.fuel, category: appliance.category, coPpm: 0, co2Pct: null, o2Pct: null, flueTempC: null, airTempC: null, ratio: null, coAirFreePpm: null }, ratioRising: true })
      : [];
  return { appliance, points, trend, hints };
}
