// The frame of every signed-in area: name mark, who is signed in, the area's links, sign-out.
import Link from 'next/link';
import { HearthGlyph } from '@/components/brand/hearth-mark';
import { SignOutButton } from './sign-out-button';
import { ROLE_LABELS, type Role } from '@/lib/auth/roles';

export type NavItem = { href: string; label: string };

export function AppShell({ user, nav, children, wide = false }: { user: { name: string; role: Role }; nav: NavItem[]; children: React.ReactNode; wide?: boolean }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <header className="bg-ink text-paper">
        <div className={`mx-auto flex items-center gap-3 px-3 py-2 ${wide ? 'max-w-6xl' : 'max-w-2xl'}`}>
          <Link href="/" className="flex items-center gap-2 font-bold" aria-label="Hearthmark home">
            <HearthGlyph size={28} />
            <span className="hidden sm:inline">Hearthmark</span>
          </Link>
          <p className="ml-auto truncate text-sm" data-testid="signed-in-as">
            {user.name} <span className="opacity-75">· {ROLE_LABELS[user.role]}</span>
          </p>
          <SignOutButton />
        </div>
        {nav.length > 0 ? (
          <nav aria-label="Sections" className="border-t border-white/10">
            <ul className={`mx-auto flex gap-1 overflow-x-auto px-2 ${wide ? 'max-w-6xl' : 'max-w-2xl'}`}>
              {nav.map((item) => (
                <li key={item.href}>
                  <Link href={item.href} className="inline-flex min-h-11 items-center whitespace-nowrap px-3 text-sm font-semibold text-paper/90 hover:text-white">
                    {item.label}
                  </Link>
                </li>
              ))}
            </ul>
          </nav>
        ) : null}
      </header>
      <main className={`mx-auto w-full flex-1 px-3 py-4 ${wide ? 'max-w-6xl' : 'max-w-2xl'}`}>{children}</main>
    </div>
  );
}
