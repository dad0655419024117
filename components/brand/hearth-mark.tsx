// The Hearthmark name mark: a copper tile holding a hearth arch with a flame, and the word beside it.
export function HearthGlyph({ size = 32, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 64 64" aria-hidden="true" className={className}>
      <rect x="2" y="2" width="60" height="60" rx="14" fill="#a8471f" />
      <path d="M14 52V30a18 18 0 0 1 36 0v22" fill="none" stroke="#f7f5f0" strokeWidth="5" strokeLinecap="round" />
      <path d="M32 50c-6 0-9-4-9-8.5 0-5 4-7.5 5.5-12 2.5 3 3 5.5 2.5 8 2-1 3.5-3 4-5.5 3 3 6 6 6 9.5 0 4.5-3 8.5-9 8.5z" fill="#f7f5f0" />
      <path d="M10 54h44" stroke="#f7f5f0" strokeWidth="4" strokeLinecap="round" />
    </svg>
  );
}

export function HearthMark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className ?? ''}`}>
      <HearthGlyph size={28} />
      <span className="text-lg">Hearthmark</span>
    </span>
  );
}
