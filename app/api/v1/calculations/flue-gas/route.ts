import { apiRoute, parseJson } from '@/lib/api/handler';
import { STAFF_ROLES } from '@/lib/auth/roles';
import { flueGasBodySchema } from '@/lib/validations/calculations';
import { analyseFlueGas } from '@/lib/combustion';

export const runtime = 'nodejs';

// The same pure calculation the field app runs offline, for integrators and as a cross-check.
// Out-of-range figures raise CombustionInputError, which the wrapper answers with 422 naming the field.
export const POST = apiRoute(STAFF_ROLES, async ({ req }) => {
  const body = await parseJson(req, flueGasBodySchema);
  const { co2Pct, o2Pct, flueTempC, airTempC, co2MaxPct, ...rest } = body;
  const optional = Object.fromEntries(
    Object.entries({ co2Pct, o2Pct, flueTempC, airTempC, co2MaxPct }).filter(([, v]) => v !== null && v !== undefined),
  );
  return analyseFlueGas({ ...rest, ...optional });
});
