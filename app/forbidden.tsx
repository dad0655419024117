import Link from 'next/link';

export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-4 px-4">
      <p className="text-sm font-bold uppercase tracking-wide text-danger">403 · Not for your account</p>
      <h1 className="text-2xl font-bold">This area belongs to another role</h1>
      <p className="text-ink-soft">You are signed in, but your account cannot open this page. Go back to your own home, or sign in with a different account.</p>
      <div className="flex gap-3">
        <Link href="/" className="font-semibold text-copper underline">Go to my home</Link>
        <Link href="/sign-in" className="font-semibold text-copper underline">Switch account</Link>
      </div>
    </main>
  );
}
