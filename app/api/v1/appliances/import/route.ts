import { z } from 'zod';
import { apiRoute, parseQuery } from '@/lib/api/handler';
import { commitImport, previewAppliances, readCsvBody } from '@/lib/csv/import';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

const query = z.object({ mode: z.enum(['preview', 'commit'], { message: 'mode must be preview or commit' }).default('preview') }).strict();

// Preview reports every bad row and column and writes nothing; commit writes all rows or none.
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const { mode } = parseQuery(req, query);
  const csv = await readCsvBody(req);
  if (mode === 'preview') {
    const p = await previewAppliances(user.organisationId, csv);
    return { total: p.total, valid: p.valid, errors: p.errors, sample: p.rows.slice(0, 20) };
  }
  const result = await commitImport(actorFrom(user), 'appliances', csv);
  return Response.json(result, { status: result.errors.length ? 422 : 201 });
});
