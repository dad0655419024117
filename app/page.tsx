import Link from 'next/link';
import { redirect } from 'next/navigation';
import { HearthMark } from '@/components/brand/hearth-mark';
import { ButtonLink } from '@/components/ui/button';
import { getSessionUser } from '@/lib/auth/session';
import { homeFor } from '@/lib/auth/roles';

export default async function HomePage() {
  const user = await getSessionUser();
  if (user) redirect(homeFor(user.role));
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-6 px-4 py-10">
      <HearthMark className="text-2xl" />
      <h1 className="text-3xl font-bold leading-tight">Appliance safety checks, recorded once and certified right.</h1>
      <p className="text-ink-soft">
        Engineers record flue gas readings, room CO checks and findings on site, even with no signal. The office reviews,
        certifies and invoices. Landlords and homeowners get their certificates and pay online.
      </p>
      <div className="flex flex-col gap-3">
        <ButtonLink href="/sign-in">Sign in</ButtonLink>
      </div>
      <p className="text-sm text-ink-soft">
        Holding a certificate? Scan its QR code to check it is genuine and in date. <Link className="underline" href="/sign-in">Staff sign-in</Link>
      </p>
    </main>
  );
}
