// Verdict levels never rely on colour alone: each has its own shape, a symbol and a word.
export type VerdictLevel = 'clear' | 'service' | 'danger' | 'unknown';

export const VERDICT_WORDS: Record<VerdictLevel, string> = {
  clear: 'Clear',
  service: 'Service',
  danger: 'Danger',
  unknown: 'No limit',
};

const STYLES: Record<VerdictLevel, string> = {
  clear: 'bg-clear-soft text-clear border-clear',
  service: 'bg-service-soft text-service border-service',
  danger: 'bg-danger text-white border-danger',
  unknown: 'bg-unknown-soft text-unknown border-unknown border-dashed',
};

function Shape({ level }: { level: VerdictLevel }) {
  const common = { width: 18, height: 18, viewBox: '0 0 20 20', 'aria-hidden': true } as const;
  switch (level) {
    case 'clear': // circle with a tick
      return (
        <svg {...common}>
          <circle cx="10" cy="10" r="9" fill="currentColor" />
          <path d="M5.5 10.5l3 3 6-7" stroke="#fff" strokeWidth="2.2" fill="none" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      );
    case 'service': // diamond with a bar: attention, not emergency
      return (
        <svg {...common}>
          <path d="M10 1l9 9-9 9-9-9z" fill="currentColor" />
          <path d="M6 10h8" stroke="#fff" strokeWidth="2.4" strokeLinecap="round" />
        </svg>
      );
    case 'danger': // octagon with an exclamation mark: make safe now
      return (
        <svg {...common}>
          <path d="M6 1h8l5 5v8l-5 5H6l-5-5V6z" fill="#fff" />
          <path d="M10 5v6" stroke="#a61b14" strokeWidth="2.6" strokeLinecap="round" />
          <circle cx="10" cy="14.6" r="1.5" fill="#a61b14" />
        </svg>
      );
    case 'unknown': // dashed ring with a question mark
      return (
        <svg {...common}>
          <circle cx="10" cy="10" r="8.5" fill="none" stroke="currentColor" strokeWidth="1.8" strokeDasharray="3 2" />
          <text x="10" y="14.5" textAnchor="middle" fontSize="12" fontWeight="700" fill="currentColor">?</text>
        </svg>
      );
  }
}

export function VerdictBadge({ level, label, size = 'md' }: { level: VerdictLevel; label?: string; size?: 'sm' | 'md' | 'lg' }) {
  const pad = size === 'lg' ? 'px-3 py-1.5 text-base' : size === 'sm' ? 'px-1.5 py-0.5 text-xs' : 'px-2 py-1 text-sm';
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-md border font-bold uppercase tracking-wide ${pad} ${STYLES[level]}`} data-verdict={level}>
      <Shape level={level} />
      {label ?? VERDICT_WORDS[level]}
    </span>
  );
}
