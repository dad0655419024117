import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { analyseFlueGas, type FlueGasInput } from '@/lib/combustion';
import { judge, resolveLimits, type ApplianceKey, type ManufacturerLimits } from '@/lib/limits';
import { verdictPreviewSchema } from '@/lib/validations/limits';
import { getOrganisationToday, getVerdictAppliance, loadLimitContext, loadLimitContextForSite } from '@/db/code-profiles';

export const runtime = 'nodejs';

/**
 * What the verdict would be for these readings, here, on this date: the combustion figures from
 * lib/combustion, the limits resolved along the jurisdiction chain, and judge's verdict with its
 * explanation. Nothing is stored. A site, jurisdiction or appliance of another organisation is a 404.
 */
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const body = await parseJson(req, verdictPreviewSchema);
  const organisationId = user.organisationId;
  const date = body.date ?? (await getOrganisationToday(organisationId));

  const context = body.siteId
    ? await loadLimitContextForSite({ organisationId, siteId: body.siteId })
    : await loadLimitContext({ organisationId, jurisdictionId: body.jurisdictionId! });

  let appliance: ApplianceKey;
  let manufacturer: ManufacturerLimits | null = null;
  if (body.applianceId) {
    const found = await getVerdictAppliance({ organisationId, siteId: body.siteId!, applianceId: body.applianceId });
    if (!found) throw new AppError('not_found', 'No such appliance at this site.');
    appliance = { category: found.category, fuel: found.fuel };
    manufacturer = found.manufacturer;
  } else {
    appliance = { category: body.category!, fuel: body.fuel! };
  }

  const figures = body.readings.map((reading) => {
    const input: FlueGasInput = { fuel: appliance.fuel, coPpm: reading.coPpm };
    // analyseFlueGas treats an absent figure as not measured; the form sends blanks as null.
    if (reading.co2Pct !== null) input.co2Pct = reading.co2Pct;
    if (reading.o2Pct !== null) input.o2Pct = reading.o2Pct;
    if (reading.flueTempC !== null) input.flueTempC = reading.flueTempC;
    if (reading.airTempC !== null) input.airTempC = reading.airTempC;
    return { testPoint: reading.testPoint, analysis: analyseFlueGas(input) };
  });

  const resolved = resolveLimits({ chain: context.chain, orgDefault: context.orgDefault, appliance, date });
  const verdict = judge({
    figures: figures.map((f) => ({ ...f.analysis, testPoint: f.testPoint })),
    roomChecks: body.roomChecks.map((r) => ({ room: r.room, coPpm: r.coPpm, minutes: r.minutes })),
    spillage: body.spillage ?? null,
    tightnessDropMbar: body.tightnessDropMbar ?? null,
    resolved,
    manufacturer,
  });

  return {
    date,
    appliance,
    jurisdictionId: context.chain[0]?.jurisdictionId ?? null,
    levels: resolved.levels,
    figures,
    verdict,
  };
});
