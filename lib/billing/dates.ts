// Dates on invoices, shown the same on screen, in PDFs and in e-mails. Pure.

/** "2 December 2026" from "2026-12-02" (a calendar date: no time zone shift). */
export function formatDateOnly(date: string): string {
  return new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' }).format(new Date(`${date.slice(0, 10)}T00:00:00Z`));
}
