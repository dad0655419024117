import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { analyserSchema } from '@/lib/validations/analysers';
import { getAnalyser, listAnalyserOverrides, updateAnalyser } from '@/db/analysers';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(['office', 'engineer'], async ({ user, params }) => {
  const analyser = await getAnalyser(user.organisationId, params.id);
  if (!analyser) throw new AppError('not_found', 'No such analyser.');
  return { analyser, overrides: user.role === 'office' ? await listAnalyserOverrides(user.organisationId, { analyserId: analyser.id }) : [] };
});

export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getAnalyser(user.organisationId, params.id))) throw new AppError('not_found', 'No such analyser.');
  const data = await parseJson(req, analyserSchema);
  const analyser = await updateAnalyser(actorFrom(user), params.id, data);
  if (!analyser) throw new AppError('not_found', 'No such analyser.');
  return { analyser };
});
