import Link from 'next/link';
import { HearthMark } from '@/components/brand/hearth-mark';

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="mx-auto flex min-h-dvh max-w-md flex-col px-4 py-6">
      <header className="mb-6">
        <Link href="/" aria-label="Hearthmark home">
          <HearthMark />
        </Link>
      </header>
      <main className="flex-1">{children}</main>
      <footer className="mt-8 text-xs text-ink-soft">Hearthmark supports, and does not replace, the judgement of a qualified engineer.</footer>
    </div>
  );
}
