'use client';
// Photos of an appliance, a finding or a locked door: from the camera or a file, shrunk on the
// phone, shown at once from a thumbnail, and uploaded from the outbox when there is a signal.
// The compressor (browser-image-compression, about 26 kB gzipped) loads only when a photo is taken,
// keeping it off the visit screen's first load; the service worker precaches it for offline use.
import { useId, useRef, useState } from 'react';
import { newId } from '@/lib/ids';
import type { PhotoMeta } from '@/lib/validations/inspection';
import type { VisitContext } from './use-field';

type Target = { purpose: PhotoMeta['purpose']; applianceId: string | null; findingId: string | null };

export function PhotoStrip({ ctx, target, label, onAdded }: { ctx: VisitContext; target: Target; label: string; onAdded?: (photoId: string) => void }) {
  const camera = useRef<HTMLInputElement>(null);
  const picker = useRef<HTMLInputElement>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const uid = useId();
  const photos = ctx.record.photos.filter((p) => p.purpose === target.purpose && p.applianceId === target.applianceId && p.findingId === target.findingId);

  const add = async (file: File | undefined) => {
    if (!file) return;
    setBusy(true);
    setError(null);
    try {
      const { compressPhoto } = await import('@/lib/sync/photo');
      const compressed = await compressPhoto(file);
      const id = newId();
      await ctx.field.addPhoto({
        visitId: ctx.record.visitId,
        ref: { id, purpose: target.purpose, applianceId: target.applianceId, findingId: target.findingId, caption: null, takenAt: new Date().toISOString(), thumbnail: compressed.thumbnail },
        bytes: compressed.bytes,
        mime: compressed.mime,
        label: `Photo — ${label}`,
      });
      onAdded?.(id);
    } catch (err) {
      // A PhotoReadError's message already tells the engineer what to do.
      setError(err instanceof Error ? err.message : 'The photo could not be saved on this phone.');
    } finally {
      setBusy(false);
      if (camera.current) camera.current.value = '';
      if (picker.current) picker.current.value = '';
    }
  };

  const statusOf = (photoId: string) => ctx.entries.find((e) => e.id === photoId)?.status;

  return (
    <div className="flex flex-col gap-2" data-testid={`photos-${target.purpose}`}>
      {photos.length > 0 ? (
        <ul className="flex flex-wrap gap-2">
          {photos.map((p) => {
            const status = statusOf(p.id);
            return (
              <li key={p.id} className="relative">
                {p.thumbnail ? (
                  // A data URL from the phone's own store: next/image cannot optimise it.
                  // eslint-disable-next-line @next/next/no-img-element
                  <img src={p.thumbnail} alt={`Photo: ${label}`} className="h-20 w-20 rounded-lg border border-line object-cover" />
                ) : (
                  <span className="flex h-20 w-20 items-center justify-center rounded-lg border border-line text-xs">Photo</span>
                )}
                <span className={`absolute bottom-1 left-1 rounded px-1 text-[11px] font-bold ${status === 'sent' ? 'bg-clear text-white' : status === 'rejected' ? 'bg-danger text-white' : 'bg-white text-ink'}`}>
                  {status === 'sent' ? 'Sent' : status === 'rejected' ? 'Refused' : status === 'failed' ? 'Retrying' : 'Waiting'}
                </span>
              </li>
            );
          })}
        </ul>
      ) : null}
      {!ctx.closed ? (
        <div className="flex flex-wrap gap-2">
          <label htmlFor={`${uid}-camera`} className="inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-line bg-white px-3 text-sm font-semibold">
            {busy ? 'Saving photo…' : 'Take photo'}
          </label>
          <input id={`${uid}-camera`} ref={camera} type="file" accept="image/*" capture="environment" className="sr-only" disabled={busy} onChange={(e) => void add(e.target.files?.[0])} />
          <label htmlFor={`${uid}-file`} className="inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-line bg-white px-3 text-sm font-semibold">
            Choose a file
          </label>
          <input id={`${uid}-file`} ref={picker} type="file" accept="image/jpeg,image/png,image/webp" className="sr-only" disabled={busy} onChange={(e) => void add(e.target.files?.[0])} data-testid={`photo-file-${target.purpose}`} />
        </div>
      ) : null}
      {error ? (
        <p className="text-sm font-semibold text-danger" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
