import type { ReactNode } from 'react';

type Tone = 'info' | 'error' | 'success' | 'warning';
const TONES: Record<Tone, string> = {
  info: 'border-ink-soft/30 bg-white',
  error: 'border-danger bg-danger-soft text-danger',
  success: 'border-clear bg-clear-soft text-clear',
  warning: 'border-service bg-service-soft text-service',
};

export function Alert({ tone = 'info', title, children }: { tone?: Tone; title?: string; children?: ReactNode }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-lg border-l-4 p-3 text-sm ${TONES[tone]}`}>
      {title ? <p className="font-bold">{title}</p> : null}
      {children ? <div className={title ? 'mt-1' : ''}>{children}</div> : null}
    </div>
  );
}
