import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { analyserOverrideSchema } from '@/lib/validations/analysers';
import { getAnalyser, listAnalyserOverrides, recordAnalyserOverride } from '@/db/analysers';
import { z } from 'zod';

export const runtime = 'nodejs';

const query = z.object({ visitId: z.string().uuid('visitId must be an id').optional(), analyserId: z.string().uuid('analyserId must be an id').optional() }).strict();

export const GET = apiRoute(['office'], async ({ req, user }) => ({ overrides: await listAnalyserOverrides(user.organisationId, parseQuery(req, query)) }));

// An engineer choosing an analyser past its calibration date records why; in date, no reason is needed.
export const POST = apiRoute(['engineer'], async ({ req, user }) => {
  const input = await parseJson(req, analyserOverrideSchema);
  const analyser = await getAnalyser(user.organisationId, input.analyserId);
  if (!analyser) throw new AppError('not_found', 'No such analyser.');
  if (!analyser.status.overrideRequired) throw new AppError('conflict', 'This analyser is in calibration; no override is needed.');
  const override = await recordAnalyserOverride({ organisationId: user.organisationId, engineerId: user.id, analyserId: analyser.id, visitId: input.visitId ?? null, reason: input.reason });
  return NextResponse.json({ override }, { status: 201 });
});
