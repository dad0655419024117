// What stops a visit being submitted. The phone lists these beside the submit button; the server
// checks the same list on submit, so a visit with an unrecorded make-safe never gets through.
import { calibrationOverdue, currentReadings, type VisitVerdicts } from './verdict';
import type { RecordedReading } from './types';

export type SubmitCheckInput = {
  appliances: ReadonlyArray<{
    applianceId: string;
    label: string;
    readings: readonly RecordedReading[];
    notTestedReason: string | null;
    analyserId: string | null;
    analyserOverrideReason: string | null;
  }>;
  analysers: ReadonlyArray<{ id: string; calibrationDue: string; serial: string }>;
  verdicts: VisitVerdicts;
  hasSignoff: boolean;
  /** YYYY-MM-DD of the visit. */
  date: string;
};

export type SubmitBlocker = { key: string; applianceId: string | null; message: string };

/** An override reason shorter than this reads as a placeholder, not a reason. */
export const MIN_OVERRIDE_REASON_CHARS = 10;

export function submitBlockers(input: SubmitCheckInput): SubmitBlocker[] {
  const blockers: SubmitBlocker[] = [];
  for (const a of input.appliances) {
    const readings = currentReadings(a.readings);
    if (readings.length === 0 && !a.notTestedReason) {
      blockers.push({ key: `untested:${a.applianceId}`, applianceId: a.applianceId, message: `${a.label}: record a reading, or say why it was not tested` });
      continue;
    }
    if (readings.length === 0) continue;
    const analyser = input.analysers.find((x) => x.id === a.analyserId);
    if (!analyser) {
      blockers.push({ key: `analyser:${a.applianceId}`, applianceId: a.applianceId, message: `${a.label}: choose the analyser used` });
    } else if (calibrationOverdue(analyser.calibrationDue, input.date) && (a.analyserOverrideReason ?? '').trim().length < MIN_OVERRIDE_REASON_CHARS) {
      blockers.push({
        key: `calibration:${a.applianceId}`,
        applianceId: a.applianceId,
        message: `${a.label}: analyser ${analyser.serial} was due for calibration on ${analyser.calibrationDue}; give the reason it was used`,
      });
    }
  }
  for (const subject of input.verdicts.makeSafe) {
    if (subject.recorded) continue;
    const name = subject.applianceId === null ? 'The installation' : (input.appliances.find((a) => a.applianceId === subject.applianceId)?.label ?? 'An appliance');
    blockers.push({ key: `make-safe:${subject.applianceId ?? 'installation'}`, applianceId: subject.applianceId, message: `${name} is at danger: record how it was made safe` });
  }
  if (!input.hasSignoff) blockers.push({ key: 'signoff', applianceId: null, message: 'Take the signature (or say why there is none) and tick the declaration' });
  return blockers;
}
