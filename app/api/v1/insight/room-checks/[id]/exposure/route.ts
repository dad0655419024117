// GET /api/v1/insight/room-checks/:id/exposure — the COHb estimate for a room check beside the
// ambient limits and the room CO rule of the site's jurisdiction on the check's date.
import { z } from 'zod';
import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { getRoomCheckSource } from '@/db/insight';
import { estimateExposure, jurisdictionRoomLimitOn } from '@/lib/exposure';

const idSchema = z.uuid({ message: 'not a room check id' });

export const GET = apiRoute<{ id: string }>(['engineer', 'office'], async ({ user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw new AppError('not_found', 'No such room check.');
  const source = await getRoomCheckSource({ organisationId: user.organisationId, roomCheckId: id.data });
  if (!source) throw new AppError('not_found', 'No such room check.');
  const { limitContext, ...roomCheck } = source;
  const jurisdiction = jurisdictionRoomLimitOn({ ...limitContext, date: source.takenAt.slice(0, 10) });
  return { roomCheck, jurisdiction, estimate: estimateExposure({ coPpm: source.coPpm, minutes: source.minutes, jurisdiction }) };
});
