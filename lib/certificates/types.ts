// The frozen content of a certificate: everything printed on it, as plain JSON. Written once at
// issue (certificates.content_json) and never changed; the PDF, the office view and the portal all
// read this, never the live visit records, so a later edit anywhere cannot alter an issued record.
import type { Metric, TestPoint, VerdictLevel } from '@/lib/limits';

export const CERTIFICATE_CONTENT_VERSION = 1;

export type CertificateRuleRef = {
  explanation: string;
  source: string | null;
  jurisdictionName: string | null;
  threshold: number | null;
  fromManufacturer: boolean;
};

export type CertificateVerdictItem = CertificateRuleRef & {
  metric: Metric;
  metricLabel: string;
  testPoint: TestPoint | null;
  subject: string | null;
  value: number | null;
  level: VerdictLevel;
};

export type CertificateReading = {
  testPoint: TestPoint;
  coPpm: number;
  co2Pct: number | null;
  o2Pct: number | null;
  flueTempC: number | null;
  airTempC: number | null;
  ratio: number | null;
  coAirFreePpm: number | null;
  /** Which correction gave the air-free figure: by O2 (preferred) or by CO2. */
  airFreeRoute: 'o2' | 'co2' | null;
  excessAirPct: number | null;
  flueLossPct: number | null;
  warnings: string[];
  takenAt: string;
};

export type CertificateAppliance = {
  applianceId: string;
  label: string;
  category: string;
  fuel: string;
  flueType: string;
  location: string;
  make: string | null;
  model: string | null;
  serial: string | null;
  tested: boolean;
  notTestedReason: string | null;
  spillage: string | null;
  operatingPressureMbar: number | null;
  heatInputGrossKw: number | null;
  heatInputNetKw: number | null;
  analyser: { make: string; model: string; serial: string; calibrationDue: string } | null;
  analyserOverrideReason: string | null;
  readings: CertificateReading[];
  level: VerdictLevel;
  /** The rule that decided a service or danger verdict; null when every item was clear. */
  decidedBy: CertificateRuleRef | null;
  items: CertificateVerdictItem[];
};

export type CertificateFinding = {
  id: string;
  applianceLabel: string | null;
  severity: 'advice' | 'service' | 'danger';
  severityLabel: string;
  description: string;
  action: string;
  actionLabel: string;
};

export type CertificateMakeSafe = {
  applianceLabel: string | null;
  madeSafeByLabel: string;
  consent: 'given' | 'refused';
  occupantName: string | null;
  refusalNote: string | null;
  warningNoticeLeft: boolean;
};

export type CertificateContent = {
  version: typeof CERTIFICATE_CONTENT_VERSION;
  numberText: string;
  issuedOn: string;
  expiresOn: string;
  issuedAt: string;
  checkUrl: string;
  replacesNumberText: string | null;
  organisation: { name: string; address: string | null; phone: string | null; email: string | null; registrationNumber: string | null };
  engineer: { name: string; registrationNumber: string | null };
  issuedBy: string;
  site: { reference: string; addressLine1: string; addressLine2: string | null; town: string; postcode: string; jurisdictionName: string };
  visit: { id: string; date: string; kind: string };
  overall: VerdictLevel;
  appliances: CertificateAppliance[];
  roomChecks: Array<{ room: string; coPpm: number; minutes: number | null; level: VerdictLevel; explanation: string | null }>;
  tightness: { startMbar: number; endMbar: number; durationMin: number; dropMbar: number; level: VerdictLevel; explanation: string | null } | null;
  findings: CertificateFinding[];
  makeSafe: CertificateMakeSafe[];
  signoff: { occupantName: string | null; signed: boolean; noSignatureReason: string | null; declarationText: string; declaredAt: string } | null;
  caution: string[];
  roomCoAdvice: string[];
};

/** What a certificate is now: valid until its expiry date has passed, void once voided. */
export type CertificateStatus = 'valid' | 'expired' | 'void';
