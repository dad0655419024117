// Analyser calibration state, for the office register and the field app alike. Pure.
// The warning window is the organisation's configured policy (30 days unless changed); an
// analyser past its due date may still be chosen only with a recorded override reason.
import { daysBetween, type IsoDate } from '@/lib/renewals/dates';

export type AnalyserCalibration = { calibrationDue: IsoDate; calibratedOn?: IsoDate; active?: boolean };

export type AnalyserStatus = {
  state: 'ok' | 'due_soon' | 'overdue';
  /** Days until due (negative once overdue). */
  daysLeft: number;
  /** Choosing it needs an override reason from the engineer. */
  overrideRequired: boolean;
  message: string;
};

export const DEFAULT_CALIBRATION_WARNING_DAYS = 30;

export function analyserStatus(analyser: AnalyserCalibration, date: IsoDate, warningDays = DEFAULT_CALIBRATION_WARNING_DAYS): AnalyserStatus {
  const daysLeft = daysBetween(date, analyser.calibrationDue);
  // Due on the date itself still counts as in calibration; the day after it is overdue.
  if (daysLeft < 0) {
    return { state: 'overdue', daysLeft, overrideRequired: true, message: `Calibration was due ${analyser.calibrationDue} (${-daysLeft} days ago). Give a reason to use it.` };
  }
  if (daysLeft <= warningDays) {
    return { state: 'due_soon', daysLeft, overrideRequired: false, message: `Calibration due ${analyser.calibrationDue} (in ${daysLeft} days). Book it in.` };
  }
  return { state: 'ok', daysLeft, overrideRequired: false, message: `Calibrated; next due ${analyser.calibrationDue}.` };
}
