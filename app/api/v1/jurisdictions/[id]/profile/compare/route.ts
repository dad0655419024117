import { apiRoute, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { compareRuleSets } from '@/lib/limits';
import { compareQuerySchema } from '@/lib/validations/limits';
import { requireProfile } from '../../../_lib/profile-owner';

export const runtime = 'nodejs';

// GET ?from=1&to=2: each rule added, removed, changed or unchanged between two versions.
export const GET = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const profile = await requireProfile(user, params.id);
  const query = parseQuery(req, compareQuerySchema);
  const from = profile.versions.find((v) => v.version === query.from);
  const to = profile.versions.find((v) => v.version === query.to);
  if (!from || !to) throw new AppError('not_found', 'No such profile version.');
  return {
    from: { version: from.version, effectiveFrom: from.effectiveFrom, summary: from.summary },
    to: { version: to.version, effectiveFrom: to.effectiveFrom, summary: to.summary },
    changes: compareRuleSets(from.rules, to.rules),
  };
});
