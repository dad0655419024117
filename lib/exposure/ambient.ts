// Published ambient CO limits and symptom bands, as plain data for the exposure panel. Figures and
// confidence come from the reference sheet's "Ambient CO exposure" section.

/** mg/m3 → ppm for CO at 25 °C and 101.325 kPa (ideal gas law; reference sheet "ppm → mg/m3"). */
export function coMgPerM3ToPpm(mgPerM3: number): number {
  return (mgPerM3 * 24.465) / 28.01;
}

export type AmbientLimit = {
  body: string;
  /** Averaging time, minutes (a ceiling is 0). */
  averagingMin: number;
  ppm: number;
  /** How the figure is stated by the body when not in ppm (e.g. "35 mg/m3"). */
  statedAs: string | null;
  source: string;
  /** Occupational limits are for healthy workers, not for people at home. */
  kind: 'residential' | 'outdoor' | 'occupational' | 'jurisdiction';
};

export const WHO_LIMITS: AmbientLimit[] = [
  { body: 'WHO indoor air', averagingMin: 15, ppm: coMgPerM3ToPpm(100), statedAs: '100 mg/m3', source: 'WHO guidelines for indoor air quality (2010)', kind: 'residential' },
  { body: 'WHO indoor air', averagingMin: 60, ppm: coMgPerM3ToPpm(35), statedAs: '35 mg/m3', source: 'WHO guidelines for indoor air quality (2010)', kind: 'residential' },
  { body: 'WHO indoor air', averagingMin: 480, ppm: coMgPerM3ToPpm(10), statedAs: '10 mg/m3', source: 'WHO guidelines for indoor air quality (2010)', kind: 'residential' },
  { body: 'WHO indoor air', averagingMin: 1440, ppm: coMgPerM3ToPpm(7), statedAs: '7 mg/m3', source: 'WHO guidelines for indoor air quality (2010)', kind: 'residential' },
];

/** Other bodies' figures, for context beside the WHO and the site's own jurisdiction. */
export const OTHER_LIMITS: AmbientLimit[] = [
  { body: 'Health Canada (residential)', averagingMin: 60, ppm: 25, statedAs: null, source: 'Health Canada residential indoor air guideline', kind: 'residential' },
  { body: 'Health Canada (residential)', averagingMin: 1440, ppm: 10, statedAs: null, source: 'Health Canada residential indoor air guideline', kind: 'residential' },
  { body: 'US EPA (outdoor air)', averagingMin: 60, ppm: 35, statedAs: null, source: 'US EPA NAAQS, 40 CFR 50.8', kind: 'outdoor' },
  { body: 'US EPA (outdoor air)', averagingMin: 480, ppm: 9, statedAs: null, source: 'US EPA NAAQS, 40 CFR 50.8', kind: 'outdoor' },
  { body: 'UK HSE (workplace)', averagingMin: 480, ppm: 20, statedAs: null, source: 'HSE EH40 workplace exposure limits', kind: 'occupational' },
  { body: 'OSHA (workplace)', averagingMin: 480, ppm: 50, statedAs: null, source: 'OSHA PEL, 8-h TWA', kind: 'occupational' },
];

export type SymptomBand = { fromPct: number; toPct: number | null; label: string };

/** Clinical references, via the reference sheet; lower levels matter for people with heart disease. */
export const SYMPTOM_BANDS: SymptomBand[] = [
  { fromPct: 0, toPct: 2.5, label: 'Background to low: within the level WHO guidance aims to keep below' },
  { fromPct: 2.5, toPct: 15, label: 'Usually no symptoms in healthy adults; people with heart disease may be affected' },
  { fromPct: 15, toPct: 20, label: 'Headache' },
  { fromPct: 20, toPct: 40, label: 'Nausea, dizziness and confusion' },
  { fromPct: 40, toPct: 60, label: 'Collapse' },
  { fromPct: 60, toPct: null, label: 'Often fatal' },
];

export const SYMPTOM_SOURCE = 'Clinical references, via the reference sheet; WHO aims at COHb ≤ 2.5 %';

export function symptomBandFor(cohbPct: number): SymptomBand {
  let band = SYMPTOM_BANDS[0]!;
  for (const b of SYMPTOM_BANDS) if (cohbPct >= b.fromPct) band = b;
  return band;
}

export function averagingLabel(minutes: number): string {
  if (minutes === 0) return 'ceiling';
  if (minutes < 60) return `${minutes} min`;
  const hours = minutes / 60;
  return `${Number.isInteger(hours) ? hours : hours.toFixed(1)} h`;
}
