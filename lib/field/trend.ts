// The field bundle's "getting worse" flags: lib/insight's appliance history reduced to what the
// visit screen shows (ratio points against their limits, the flag, hints). Server side only, kept
// out of lib/field's index so the phone's bundle never carries the history maths.
import { buildApplianceHistory, type HistoryInspectionInput } from '../insight';
import type { FieldBundle, FieldTrend, LimitContext } from './types';
import type { ApplianceDetails } from '../validations/inspection';

/** Inspections the phone shows on the ratio sparkline and table; the flag itself uses them all. */
export const TREND_POINTS_SHOWN = 6;

export function fieldTrend(input: { applianceId: string; details: ApplianceDetails; inspections: HistoryInspectionInput[]; limitContext: LimitContext }): FieldTrend {
  const history = buildApplianceHistory({
    appliance: {
      id: input.applianceId,
      label: input.details.location,
      category: input.details.category,
      fuel: input.details.fuel,
      manufacturer: { coCo2Ratio: input.details.mfrRatioMax, coAirFreePpm: input.details.mfrCoAirFreeMaxPpm },
    },
    inspections: input.inspections,
    limitContext: input.limitContext,
  });
  return {
    worsening: history.trend.worsening,
    reasons: history.trend.reasons,
    message: history.trend.message,
    points: history.points.slice(-TREND_POINTS_SHOWN).map((p) => ({
      date: p.date,
      verdict: p.verdict,
      ratio: p.ratio,
      serviceLimit: p.limits.ratio.service,
      dangerLimit: p.limits.ratio.danger,
    })),
    inspections: history.points.length,
    hints: history.hints.map(({ code, title, because, checks }) => ({ code, title, because, checks })),
  };
}

/**
 * Adds each appliance's trend to a bundle, from its finished inspections other than the visit's own
 * (a visit already submitted does not count towards its own flag).
 */
export function withTrends(bundle: FieldBundle, inspectionsByAppliance: Map<string, HistoryInspectionInput[]>): FieldBundle {
  const empty: LimitContext = { chain: [], orgDefault: null };
  return {
    ...bundle,
    visits: bundle.visits.map((visit) => ({
      ...visit,
      appliances: visit.appliances.map((a) => ({
        ...a,
        trend: fieldTrend({
          applianceId: a.id,
          details: a.details,
          inspections: (inspectionsByAppliance.get(a.id) ?? []).filter((i) => i.visitId !== visit.id),
          limitContext: bundle.limitContexts[visit.site.jurisdictionId] ?? empty,
        }),
      })),
    })),
  };
}
