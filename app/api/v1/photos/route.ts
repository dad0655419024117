import { createHash } from 'node:crypto';
import { NextResponse } from 'next/server';
import { apiRoute } from '@/lib/api/handler';
import { AppError, fieldsFromIssues } from '@/lib/errors';
import { MAX_PHOTO_BYTES, photoMetaSchema } from '@/lib/validations/inspection';
import { cleanImage } from '@/lib/storage/images';
import { fileStore } from '@/lib/storage';
import { checkPhotoUpload, createPhoto } from '@/db/photos';

export const runtime = 'nodejs';

// Room for the form fields around the file.
const FORM_OVERHEAD_BYTES = 64 * 1024;

// A photo from the field outbox: multipart form with the file and its details. Resending the same
// photo id answers with the photo already stored, so a retried upload never makes a second copy.
export const POST = apiRoute(['engineer'], async ({ req, user }) => {
  const declared = Number(req.headers.get('content-length') ?? '0');
  if (declared > MAX_PHOTO_BYTES + FORM_OVERHEAD_BYTES) throw new AppError('payload_too_large', `The photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`, { file: 'Too large' });
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new AppError('bad_request', 'Send the photo as multipart form data.');
  }
  const file = form.get('file');
  if (!(file instanceof Blob)) throw new AppError('invalid_input', 'No photo was attached.', { file: 'Attach a photo' });
  if (file.size > MAX_PHOTO_BYTES) throw new AppError('payload_too_large', `The photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`, { file: 'Too large' });
  if (file.size === 0) throw new AppError('invalid_input', 'The photo is empty.', { file: 'Empty file' });

  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === 'string') fields[key] = value;
  // As for JSON bodies (lib/api/handler.ts): PostgreSQL cannot store NUL in text, so refuse it here on both engines.
  const withNul = Object.keys(fields).filter((k) => k.includes('\u0000') || fields[k]!.includes('\u0000'));
  if (withNul.length) throw new AppError('invalid_input', 'Text may not contain NUL characters.', Object.fromEntries(withNul.map((k) => [k.replaceAll('\u0000', ''), 'remove the NUL (\\u0000) characters'])));
  const parsed = photoMetaSchema.safeParse(fields);
  if (!parsed.success) throw new AppError('invalid_input', 'Some photo details are not valid.', fieldsFromIssues(parsed.error.issues));
  const meta = parsed.data;

  const { existing } = await checkPhotoUpload({ organisationId: user.organisationId, engineerId: user.id, meta });
  if (existing) return { photo: { id: existing.id, width: existing.width, height: existing.height, bytes: existing.bytes }, duplicate: true };

  const image = await cleanImage(new Uint8Array(await file.arrayBuffer()));
  const storageKey = `${user.organisationId}/${meta.visitId}/${meta.id}.${image.ext}`;
  await fileStore().put(storageKey, image.bytes);
  const photo = await createPhoto({
    organisationId: user.organisationId,
    uploadedBy: user.id,
    meta,
    storageKey,
    mime: image.mime,
    bytes: image.bytes.length,
    width: image.width,
    height: image.height,
    sha256: createHash('sha256').update(image.bytes).digest('hex'),
  });
  return NextResponse.json({ photo: { id: photo.id, width: photo.width, height: photo.height, bytes: photo.bytes }, duplicate: false }, { status: 201 });
});
