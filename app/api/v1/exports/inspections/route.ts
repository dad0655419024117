// GET /api/v1/exports/inspections?from=YYYY-MM-DD&to=YYYY-MM-DD — CSV of inspections and their
// current readings for visits in the range (inclusive), for the office. Cells are formula-safe.
import { z } from 'zod';
import { apiRoute, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { listExportRows } from '@/db/exports';
import { toCsv } from '@/lib/insight';
import { addDays, daysBetween } from '@/lib/renewals';
import { coCo2Ratio } from '@/lib/combustion';

const MAX_RANGE_DAYS = 366 * 3;
const date = z.iso.date({ message: 'must be a date YYYY-MM-DD' });
const querySchema = z.object({ from: date, to: date }).strict();

const HEADER = ['Visit date', 'Visit id', 'Visit status', 'Site', 'Address', 'Engineer', 'Appliance id', 'Category', 'Fuel', 'Location', 'Make and model', 'Verdict', 'Test point', 'CO ppm', 'CO2 %', 'O2 %', 'CO/CO2 ratio', 'Flue temp °C', 'Air temp °C', 'Reading taken at'];

function ratio(coPpm: number | null, co2Pct: number | null): number | null {
  if (coPpm === null || co2Pct === null || co2Pct <= 0) return null;
  try {
    return Number(coCo2Ratio(coPpm, co2Pct).toFixed(6));
  } catch {
    return null;
  }
}

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(req, querySchema);
  if (q.to < q.from) throw new AppError('bad_request', 'The range ends before it starts.', { to: 'must be on or after from' });
  if (daysBetween(q.from, q.to) > MAX_RANGE_DAYS) throw new AppError('bad_request', `Export at most ${MAX_RANGE_DAYS} days at a time.`, { to: `at most ${MAX_RANGE_DAYS} days after from` });
  const rows = await listExportRows({ organisationId: user.organisationId, from: q.from, to: q.to, toExclusive: addDays(q.to, 1) });
  const csv = toCsv({
    header: HEADER,
    rows: rows.map((r) => [
      r.visitDate, r.visitId, r.visitStatus, r.siteReference, r.address, r.engineerName, r.applianceId, r.category, r.fuel, r.location, r.makeModel, r.verdict,
      r.testPoint, r.coPpm, r.co2Pct, r.o2Pct, ratio(r.coPpm, r.co2Pct), r.flueTempC, r.airTempC, r.takenAt,
    ]),
  });
  return new Response(`\uFEFF${csv}`, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="inspections-${q.from}-to-${q.to}.csv"`,
      'cache-control': 'no-store',
    },
  });
});
