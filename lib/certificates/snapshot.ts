// Builds the frozen certificate content from a visit's stored records. The verdict of record (set
// by the server on submit) is used where present; anything without one is judged here by the very
// same lib/field code, so a certificate never shows a verdict nobody computed.
import type { VisitRecords } from '@/db/inspections';
import {
  APPLIANCE_CATEGORY_LABELS,
  FUEL_LABELS,
  METRIC_LABELS,
  worstLevel,
  type ApplianceCategory,
  type FuelId,
  type ResolvedLimits,
  type Verdict,
  type VerdictItem,
  type VerdictLevel,
} from '@/lib/limits';
import { FINDING_LEVEL, currentReadings, visitVerdicts, type LimitContext } from '@/lib/field';
import { FINDING_ACTION_LABELS, FINDING_SEVERITY_LABELS, FLUE_TYPE_LABELS, MADE_SAFE_BY_LABELS, type FlueType } from '@/lib/validations/inspection';
import { CAUTION_LINES, HIGH_ROOM_CO_ADVICE } from '@/components/safety/caution';
import { CERTIFICATE_CONTENT_VERSION, type CertificateAppliance, type CertificateContent, type CertificateRuleRef, type CertificateVerdictItem } from './types';

export type SnapshotInput = {
  numberText: string;
  issuedOn: string;
  expiresOn: string;
  issuedAt: string;
  checkUrl: string;
  replacesNumberText: string | null;
  organisation: CertificateContent['organisation'];
  engineer: CertificateContent['engineer'];
  issuedBy: string;
  site: CertificateContent['site'];
  visit: CertificateContent['visit'];
  records: VisitRecords;
  analysers: Array<{ id: string; serial: string; make: string; model: string; calibrationDue: string }>;
  /** The stored installation verdict of record (room CO, tightness), when submit wrote one. */
  installation: { verdict: Verdict; limits: ResolvedLimits } | null;
  limits: LimitContext;
};

export type CertificateLimitsSnapshot = {
  appliances: Record<string, ResolvedLimits>;
  installation: ResolvedLimits | null;
};

function ruleRef(item: VerdictItem): CertificateRuleRef {
  return {
    explanation: item.explanation,
    source: item.source,
    jurisdictionName: item.jurisdictionName,
    threshold: item.threshold,
    fromManufacturer: item.fromManufacturer,
  };
}

function verdictItem(item: VerdictItem): CertificateVerdictItem {
  return { ...ruleRef(item), metric: item.metric, metricLabel: METRIC_LABELS[item.metric], testPoint: item.testPoint, subject: item.subject, value: item.value, level: item.level };
}

export function applianceLabel(details: { category: string; location: string; make: string | null; model: string | null }): string {
  const kind = APPLIANCE_CATEGORY_LABELS[details.category as ApplianceCategory] ?? details.category;
  const name = [details.make, details.model].filter(Boolean).join(' ');
  return `${kind}${name ? ` (${name})` : ''}, ${details.location}`;
}

function round(value: number | null, decimals: number): number | null {
  return value === null || !Number.isFinite(value) ? null : Number(value.toFixed(decimals));
}

export function buildCertificateContent(input: SnapshotInput): { content: CertificateContent; limits: CertificateLimitsSnapshot } {
  const { records } = input;
  const computed = visitVerdicts({
    appliances: records.inspections.map((i) => ({ applianceId: i.applianceId, details: i.details, spillage: i.spillage, readings: i.readings, notTestedReason: i.notTestedReason })),
    roomChecks: records.roomChecks,
    tightness: records.tightness,
    findings: records.findings,
    makeSafe: records.makeSafe,
    limits: input.limits,
    date: input.visit.date,
  });
  const labels = new Map(records.inspections.map((i) => [i.applianceId, applianceLabel(i.details)]));
  const limitsSnapshot: CertificateLimitsSnapshot = { appliances: {}, installation: null };
  const levels: VerdictLevel[] = [];

  const appliances: CertificateAppliance[] = records.inspections.map((inspection) => {
    const result = computed.appliances[inspection.applianceId];
    const tested = Boolean(result);
    const verdict = inspection.verdict ?? result?.verdict ?? null;
    const resolved = inspection.limits ?? result?.resolved ?? null;
    if (resolved) limitsSnapshot.appliances[inspection.applianceId] = resolved;
    if (tested && verdict) levels.push(verdict.overall);
    const analyser = input.analysers.find((a) => a.id === inspection.analyserId) ?? null;
    const analyses = new Map((result?.readings ?? []).map((r) => [r.reading.id, r.analysis]));
    const d = inspection.details;
    return {
      applianceId: inspection.applianceId,
      label: labels.get(inspection.applianceId) ?? d.location,
      category: APPLIANCE_CATEGORY_LABELS[d.category] ?? d.category,
      fuel: FUEL_LABELS[d.fuel as FuelId] ?? d.fuel,
      flueType: FLUE_TYPE_LABELS[d.flueType as FlueType] ?? d.flueType,
      location: d.location,
      make: d.make,
      model: d.model,
      serial: d.serial,
      tested,
      notTestedReason: inspection.notTestedReason,
      spillage: inspection.spillage,
      operatingPressureMbar: inspection.operatingPressureMbar,
      heatInputGrossKw: inspection.heatInputGrossKw,
      heatInputNetKw: inspection.heatInputNetKw,
      analyser: analyser ? { make: analyser.make, model: analyser.model, serial: analyser.serial, calibrationDue: analyser.calibrationDue } : null,
      analyserOverrideReason: inspection.analyserOverrideReason,
      readings: currentReadings(inspection.readings).map((r) => {
        const a = analyses.get(r.id) ?? null;
        const byO2 = a?.coAirFreeFromO2Ppm ?? null;
        const byCo2 = a?.coAirFreeFromCo2Ppm ?? null;
        return {
          testPoint: r.testPoint,
          coPpm: r.coPpm,
          co2Pct: r.co2Pct,
          o2Pct: r.o2Pct,
          flueTempC: r.flueTempC,
          airTempC: r.airTempC,
          ratio: round(a?.ratio ?? null, 5),
          coAirFreePpm: round(byO2 ?? byCo2, 0),
          airFreeRoute: byO2 !== null ? 'o2' : byCo2 !== null ? 'co2' : null,
          excessAirPct: round(a?.excessAirPct ?? null, 1),
          flueLossPct: round(a?.flueLossPct ?? null, 2),
          warnings: (a?.warnings ?? []).map((w) => w.message),
          takenAt: r.takenAt,
        };
      }),
      level: tested && verdict ? verdict.overall : 'unknown',
      decidedBy: verdict?.decidedBy ? ruleRef(verdict.decidedBy) : null,
      items: (verdict?.items ?? []).map(verdictItem),
    };
  });

  const installation = input.installation ?? (computed.installation ? { verdict: computed.installation.verdict, limits: computed.installation.resolved } : null);
  if (installation) {
    levels.push(installation.verdict.overall);
    limitsSnapshot.installation = installation.limits;
  }
  const roomItems = installation?.verdict.items.filter((i) => i.metric === 'room_co_ppm') ?? [];
  const tightnessItem = installation?.verdict.items.find((i) => i.metric === 'tightness_drop_mbar') ?? null;
  for (const f of records.findings) levels.push(FINDING_LEVEL[f.severity]);

  const content: CertificateContent = {
    version: CERTIFICATE_CONTENT_VERSION,
    numberText: input.numberText,
    issuedOn: input.issuedOn,
    expiresOn: input.expiresOn,
    issuedAt: input.issuedAt,
    checkUrl: input.checkUrl,
    replacesNumberText: input.replacesNumberText,
    organisation: input.organisation,
    engineer: input.engineer,
    issuedBy: input.issuedBy,
    site: input.site,
    visit: input.visit,
    overall: worstLevel(levels),
    appliances,
    roomChecks: records.roomChecks.map((c) => {
      const item = roomItems.find((i) => i.subject === c.room) ?? null;
      return { room: c.room, coPpm: c.coPpm, minutes: c.minutes, level: item?.level ?? 'unknown', explanation: item?.explanation ?? null };
    }),
    tightness: records.tightness
      ? {
          startMbar: records.tightness.startMbar,
          endMbar: records.tightness.endMbar,
          durationMin: records.tightness.durationMin,
          dropMbar: Number((records.tightness.startMbar - records.tightness.endMbar).toFixed(3)),
          level: tightnessItem?.level ?? 'unknown',
          explanation: tightnessItem?.explanation ?? null,
        }
      : null,
    findings: records.findings.map((f) => ({
      id: f.id,
      applianceLabel: f.applianceId ? (labels.get(f.applianceId) ?? null) : null,
      severity: f.severity,
      severityLabel: FINDING_SEVERITY_LABELS[f.severity],
      description: f.description,
      action: f.action,
      actionLabel: FINDING_ACTION_LABELS[f.action] ?? f.action,
    })),
    makeSafe: records.makeSafe.map((m) => ({
      applianceLabel: m.applianceId ? (labels.get(m.applianceId) ?? null) : null,
      madeSafeByLabel: MADE_SAFE_BY_LABELS[m.madeSafeBy],
      consent: m.consent,
      occupantName: m.occupantName,
      refusalNote: m.refusalNote,
      warningNoticeLeft: m.warningNoticeLeft,
    })),
    signoff: records.signoff
      ? {
          occupantName: records.signoff.occupantName,
          signed: records.signoff.signaturePhotoId !== null,
          noSignatureReason: records.signoff.noSignatureReason,
          declarationText: records.signoff.declarationText,
          declaredAt: records.signoff.declaredAt,
        }
      : null,
    caution: [...CAUTION_LINES],
    roomCoAdvice: [...HIGH_ROOM_CO_ADVICE],
  };
  return { content, limits: limitsSnapshot };
}

/** Plain-text figure formatting shared by the PDF, the screens and the tests. */
export function fmt(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(decimals);
}
