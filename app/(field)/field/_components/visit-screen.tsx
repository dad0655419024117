'use client';
// One visit on the phone. Its parts (overview, each appliance, rooms and gas, finish, no access) are
// chosen by the URL's #fragment, so the whole visit is one page the service worker keeps for offline
// use, and the phone's back button still steps between parts.
// Only the overview comes with the page: the other parts (their forms, zod schemas, the signature
// pad) load when first opened, or as soon as the engineer first touches the screen. The service
// worker precaches their scripts, so they open offline too.
import dynamic from 'next/dynamic';
import Link from 'next/link';
import { useEffect, useSyncExternalStore } from 'react';
import { Alert } from '@/components/ui/alert';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SyncStatus } from './sync-status';
import { useVisit, type VisitContext } from './use-field';
import { VisitOverview } from './visit-overview';

const loadAppliance = () => import('./appliance-screen');
const loadInstallation = () => import('./installation-screen');
const loadFinish = () => import('./finish-screen');
const loadNoAccess = () => import('./no-access');

const opening = () => <p className="text-ink-soft">Opening…</p>;
const ApplianceScreen = dynamic(() => loadAppliance().then((m) => m.ApplianceScreen), { ssr: false, loading: opening });
const InstallationScreen = dynamic(() => loadInstallation().then((m) => m.InstallationScreen), { ssr: false, loading: opening });
const FinishScreen = dynamic(() => loadFinish().then((m) => m.FinishScreen), { ssr: false, loading: opening });
const NoAccessScreen = dynamic(() => loadNoAccess().then((m) => m.NoAccessScreen), { ssr: false, loading: opening });

/** Fetches every part's script once the engineer first touches or types, so switching parts has no wait. */
function usePreloadParts() {
  useEffect(() => {
    const preload = () => {
      for (const load of [loadAppliance, loadInstallation, loadFinish, loadNoAccess]) void load().catch(() => undefined);
    };
    const events = ['pointerdown', 'keydown', 'touchstart'] as const;
    const once = () => {
      for (const e of events) window.removeEventListener(e, once, true);
      preload();
    };
    for (const e of events) window.addEventListener(e, once, { capture: true, passive: true });
    return () => {
      for (const e of events) window.removeEventListener(e, once, true);
    };
  }, []);
}

function subscribe(callback: () => void) {
  window.addEventListener('hashchange', callback);
  return () => window.removeEventListener('hashchange', callback);
}

function useHash(): string {
  return useSyncExternalStore(subscribe, () => window.location.hash.replace(/^#/, ''), () => '');
}

function SectionNav({ ctx, current }: { ctx: VisitContext; current: string }) {
  const items = [
    { hash: 'overview', label: 'Visit' },
    ...ctx.appliances.map((a, i) => {
      const level = ctx.verdicts.appliances[a.id]?.verdict.overall;
      return { hash: `appliance-${a.id}`, label: `${i + 1}. ${(ctx.record.inspections[a.id]?.details ?? a.details).location}`, level };
    }),
    { hash: 'installation', label: 'Rooms & gas', level: ctx.verdicts.installation?.verdict.overall },
    { hash: 'finish', label: 'Finish' },
  ];
  return (
    <nav aria-label="Parts of this visit" className="sticky top-0 z-20 -mx-3 border-b border-line bg-paper/95 px-3 py-2 backdrop-blur">
      <ul className="flex gap-2 overflow-x-auto">
        {items.map((item) => {
          const active = current === item.hash || (current === '' && item.hash === 'overview');
          return (
            <li key={item.hash} className="shrink-0">
              <a
                href={`#${item.hash}`}
                aria-current={active ? 'page' : undefined}
                className={`inline-flex min-h-11 items-center gap-1 rounded-full border px-3 text-sm font-semibold ${active ? 'border-ink bg-ink text-paper' : 'border-line bg-white text-ink'}`}
              >
                {item.label}
                {'level' in item && item.level && item.level !== 'clear' ? <span className="sr-only"> ({item.level})</span> : null}
                {'level' in item && item.level === 'danger' ? <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rotate-45 bg-danger" /> : null}
                {'level' in item && item.level === 'service' ? <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rotate-45 bg-service" /> : null}
              </a>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}

/** Pinned to the bottom of the screen: the visit's verdict, and the make-safe prompt when anything is at danger. */
function VerdictBar({ ctx }: { ctx: VisitContext }) {
  const v = ctx.verdicts;
  const outstanding = v.makeSafe.filter((m) => !m.recorded);
  const danger = v.overall === 'danger';
  const anythingRecorded = Object.keys(v.appliances).length > 0 || v.installation !== null || ctx.record.findings.length > 0;
  const worst = Object.values(v.appliances).find((a) => a.verdict.overall === v.overall)?.verdict.decidedBy ?? v.installation?.verdict.decidedBy;
  const awaiting = ctx.appliances.filter((a) => {
    const i = ctx.record.inspections[a.id];
    return i !== undefined && !i.notTestedReason && i.readings.length === 0;
  });
  const line = !anythingRecorded
    ? 'Nothing recorded yet.'
    : v.overall === 'unknown' && awaiting.length > 0
      ? `Readings still to record: ${awaiting.map((a) => (ctx.record.inspections[a.id]?.details ?? a.details).location).join(', ')}.`
      : v.overall === 'clear'
      ? 'Every recorded figure is within its limit.'
      : (worst?.explanation ?? ctx.record.findings.find((f) => f.severity === v.overall)?.description ?? 'Some figures could not be judged.');
  return (
    <div className={`fixed inset-x-0 bottom-0 z-30 border-t-4 ${danger ? 'border-danger bg-danger-soft' : v.overall === 'service' ? 'border-service bg-service-soft' : 'border-line bg-white'} shadow-[0_-4px_16px_rgba(0,0,0,0.12)]`} data-testid="verdict-bar" data-verdict={anythingRecorded ? v.overall : 'none'}>
      <div className="mx-auto flex max-w-2xl items-center gap-3 px-3 py-2">
        <div className="flex min-w-0 flex-1 flex-col gap-1">
          <div className="flex items-center gap-2">
            <span className="text-xs font-bold uppercase tracking-wide text-ink-soft">Visit verdict</span>
            {anythingRecorded ? <VerdictBadge level={v.overall} size="sm" /> : null}
          </div>
          <p className="line-clamp-2 text-sm">{danger && outstanding.length > 0 ? `Make safe now. ${line}` : line}</p>
        </div>
        {danger ? (
          <a href="#finish" className={`inline-flex min-h-12 shrink-0 items-center rounded-lg px-3 text-sm font-bold ${outstanding.length > 0 ? 'bg-danger text-white' : 'border border-clear bg-white text-clear'}`}>
            {outstanding.length > 0 ? 'Make safe' : 'Made safe ✓'}
          </a>
        ) : null}
      </div>
    </div>
  );
}

export function VisitScreen({ visitId }: { visitId: string }) {
  const ctx = useVisit(visitId);
  const hash = useHash();
  usePreloadParts();

  useEffect(() => {
    window.scrollTo({ top: 0 });
  }, [hash]);

  if (!ctx.field.ready && !ctx.field.storageError) return <p className="text-ink-soft">Opening the visit saved on this phone…</p>;
  if (!ctx.visit) {
    return (
      <div className="flex flex-col gap-3">
        <Link href="/field" className="text-sm font-semibold text-copper underline">
          ← My visits
        </Link>
        <Alert tone="warning" title="This visit is not saved on this phone">
          {ctx.field.online ? 'It may not be assigned to you, or the list is still loading.' : 'Open My visits once with a signal to save your visits for offline work.'}
        </Alert>
      </div>
    );
  }

  const visit = ctx.visit;
  let body: React.ReactNode;
  if (hash.startsWith('appliance-')) {
    const appliance = ctx.appliances.find((a) => a.id === hash.slice('appliance-'.length));
    body = appliance ? <ApplianceScreen ctx={ctx} appliance={appliance} /> : <Alert tone="warning">That appliance is not part of this visit.</Alert>;
  } else if (hash === 'installation') body = <InstallationScreen ctx={ctx} />;
  else if (hash === 'finish') body = <FinishScreen ctx={ctx} />;
  else if (hash === 'no-access') body = <NoAccessScreen ctx={ctx} />;
  else body = <VisitOverview ctx={ctx} />;

  return (
    <div className="flex flex-col gap-3 pb-36" data-testid="visit-screen">
      <Link href="/field" className="text-sm font-semibold text-copper underline">
        ← My visits
      </Link>
      <header>
        <h1 className="text-xl font-bold leading-tight">{visit.site.address}</h1>
        <p className="text-sm text-ink-soft">
          {visit.site.town} {visit.site.postcode} · {visit.site.reference}
        </p>
      </header>
      <SyncStatus visitId={visitId} />
      {ctx.closed ? (
        <Alert tone="info" title={ctx.record.noAccess || visit.status === 'no_access' ? 'Recorded as no access' : 'Submitted'}>
          This visit can no longer be changed on the phone. {ctx.entries.some((e) => e.status !== 'sent') ? 'Some changes are still waiting to send.' : ''}
        </Alert>
      ) : null}
      <SectionNav ctx={ctx} current={hash} />
      {body}
      <VerdictBar ctx={ctx} />
    </div>
  );
}
