// Only same-site paths are followed after sign-in, never another origin.
export function safeCallbackPath(value: string | null | undefined): string | null {
  if (!value) return null;
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  if (value.startsWith('/sign-in') || value.startsWith('/api/')) return null;
  return value;
}
