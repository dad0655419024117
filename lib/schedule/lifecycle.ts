// The visit lifecycle (DESIGN.md): booked → on_site → submitted → certified, with side exits
// no_access and cancelled. Pure, so the board, the field app and the handlers agree.
export const VISIT_STATUSES = ['booked', 'on_site', 'submitted', 'certified', 'no_access', 'cancelled'] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

const NEXT: Record<VisitStatus, readonly VisitStatus[]> = {
  booked: ['on_site', 'no_access', 'cancelled'],
  on_site: ['submitted', 'no_access'],
  submitted: ['certified'],
  certified: [],
  no_access: [],
  cancelled: [],
};

export function canTransition(from: VisitStatus, to: VisitStatus): boolean {
  return NEXT[from].includes(to);
}

/** Only a booked visit can still be moved or reassigned. */
export function isReschedulable(status: VisitStatus): boolean {
  return status === 'booked';
}

/** Statuses that occupy an engineer's time and a site's slot for clash warnings. */
export const OCCUPYING: readonly VisitStatus[] = ['booked', 'on_site'];

export const VISIT_STATUS_LABELS: Record<VisitStatus, string> = {
  booked: 'Booked',
  on_site: 'On site',
  submitted: 'Submitted',
  certified: 'Certified',
  no_access: 'No access',
  cancelled: 'Cancelled',
};
