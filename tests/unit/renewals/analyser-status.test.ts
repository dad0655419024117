// analyserStatus: warning window is the configured policy (30 days by default); due date itself is in calibration.
import { describe, expect, it } from 'vitest';
import { analyserStatus } from '@/lib/analysers';

describe('analyserStatus', () => {
  it('ok, due soon, overdue around the due date', () => {
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-01-01').state).toBe('ok');
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-03-01')).toMatchObject({ state: 'due_soon', daysLeft: 30, overrideRequired: false });
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-03-31')).toMatchObject({ state: 'due_soon', daysLeft: 0, overrideRequired: false });
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-04-01')).toMatchObject({ state: 'overdue', daysLeft: -1, overrideRequired: true });
  });
  it('a different warning window', () => {
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-02-20', 45).state).toBe('due_soon');
    expect(analyserStatus({ calibrationDue: '2027-03-31' }, '2027-02-20', 14).state).toBe('ok');
  });
});
