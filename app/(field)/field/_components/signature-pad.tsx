'use client';
// The occupant signs on the phone's screen (signature_pad); the result is a PNG data URL.
import { useEffect, useRef } from 'react';
import SignaturePad from 'signature_pad';

export function SignatureCanvas({ onChange, disabled, labelledBy }: { onChange: (png: string | null) => void; disabled?: boolean; labelledBy: string }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const pad = useRef<SignaturePad | null>(null);
  const report = useRef(onChange);
  useEffect(() => {
    report.current = onChange;
  }, [onChange]);

  useEffect(() => {
    const el = canvas.current;
    if (!el) return;
    const instance = new SignaturePad(el, { minWidth: 1, maxWidth: 2.6, penColor: '#1b2030', backgroundColor: 'rgb(255,255,255)' });
    pad.current = instance;
    // Sized for the screen's pixel density so the line is sharp; resizing clears it, so it is done once.
    const ratio = Math.max(window.devicePixelRatio || 1, 1);
    el.width = el.offsetWidth * ratio;
    el.height = el.offsetHeight * ratio;
    el.getContext('2d')?.scale(ratio, ratio);
    instance.clear();
    const ended = () => report.current(instance.isEmpty() ? null : instance.toDataURL('image/png'));
    instance.addEventListener('endStroke', ended);
    return () => {
      instance.removeEventListener('endStroke', ended);
      instance.off();
      pad.current = null;
    };
  }, []);

  useEffect(() => {
    if (!pad.current) return;
    if (disabled) pad.current.off();
    else pad.current.on();
  }, [disabled]);

  return (
    <div className="flex flex-col gap-2">
      <canvas ref={canvas} role="img" aria-labelledby={labelledBy} className="h-44 w-full touch-none rounded-lg border-2 border-dashed border-ink-soft bg-white" data-testid="signature-canvas" />
      <button
        type="button"
        disabled={disabled}
        onClick={() => {
          pad.current?.clear();
          report.current(null);
        }}
        className="min-h-11 self-start rounded-lg border border-line bg-white px-3 text-sm font-semibold"
      >
        Clear signature
      </button>
    </div>
  );
}
