import Link from 'next/link';

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-4 px-4">
      <p className="text-sm font-bold uppercase tracking-wide text-ink-soft">404</p>
      <h1 className="text-2xl font-bold">Nothing here</h1>
      <p className="text-ink-soft">The page does not exist, or it is not one your account can see.</p>
      <Link href="/" className="font-semibold text-copper underline">Go to my home</Link>
    </main>
  );
}
