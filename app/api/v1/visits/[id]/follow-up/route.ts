import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { followUpSchema } from '@/lib/validations/visits';
import { createVisit, getVisit, listOpenFindings } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

// A follow-up is raised from a visit's open findings; until the findings table exists it is raised
// from the visit alone, and the notes say so.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const origin = await getVisit(user.organisationId, params.id);
  if (!origin) throw new AppError('not_found', 'No such visit.');
  const input = await parseJson(req, followUpSchema);
  const open = await listOpenFindings(user.organisationId, origin.id);
  const chosen = open ? open.filter((f) => input.findingIds.length === 0 || input.findingIds.includes(f.id)) : [];
  if (open && input.findingIds.some((id) => !open.some((f) => f.id === id))) {
    throw new AppError('invalid_input', 'Some fields are not valid.', { findingIds: 'Only open findings of this visit can be followed up' });
  }
  const findingLines = chosen.map((f) => `• [${f.severity}] ${f.description}`).join('\n');
  const notes = [input.notes, findingLines ? `Open findings:\n${findingLines}` : null].filter(Boolean).join('\n\n') || null;
  const result = await createVisit(actorFrom(user), {
    siteId: origin.siteId, engineerId: input.engineerId, kind: 'follow_up', date: input.date, startTime: input.startTime, endTime: input.endTime, notes, followUpOf: origin.id,
  });
  return NextResponse.json(result, { status: 201 });
});
