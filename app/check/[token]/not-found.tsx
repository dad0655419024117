export default function CheckNotFound() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-3 px-4">
      <h1 className="text-2xl font-bold">No certificate found</h1>
      <p className="text-ink-soft">This link does not match a certificate. Check that the whole address was copied, or scan the code on the certificate again.</p>
    </main>
  );
}
