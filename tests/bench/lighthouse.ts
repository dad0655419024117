// Page quality with Lighthouse 12 (mobile defaults, its CLI on Debian's Chromium): performance,
// accessibility and best practices for the sign-in page, the engineer's today list and the visit
// screen, the last two signed in through the session cookie in extraHeaders. Each page runs three
// times (the median counts) beside the offline page as a same-run baseline for machine load.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { runToEnd } from '../../scripts/stack';
import { record } from './report';

type Report = { categories: Record<string, { score: number | null }>; audits: Record<string, { numericValue?: number; displayValue?: string }> };

async function lighthouse(url: string, cookie: string | null): Promise<Report> {
  const out = path.join(os.tmpdir(), `hearthmark-lh-${process.pid}-${Date.now()}.json`);
  const args = [
    url,
    '--output=json',
    `--output-path=${out}`,
    '--quiet',
    '--only-categories=performance,accessibility,best-practices',
    '--chrome-flags=--headless=new --no-sandbox --disable-dev-shm-usage',
  ];
  if (cookie) args.push(`--extra-headers=${JSON.stringify({ Cookie: cookie })}`);
  await runToEnd(path.join('node_modules', '.bin', 'lighthouse'), args, { CHROME_PATH: '/usr/bin/chromium' });
  const report = JSON.parse(fs.readFileSync(out, 'utf8')) as Report;
  fs.rmSync(out, { force: true });
  return report;
}

type Run = { report: Report; load: number };

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

/** The run whose performance score is the median of the page's runs (scores swing with machine load). */
function medianRun(runs: Run[]): Run {
  const sorted = [...runs].sort((a, b) => (a.report.categories.performance?.score ?? 0) - (b.report.categories.performance?.score ?? 0));
  return sorted[Math.floor(sorted.length / 2)]!;
}

const METRICS = ['first-contentful-paint', 'largest-contentful-paint', 'total-blocking-time', 'cumulative-layout-shift'] as const;

function metricsLine(report: Report): string {
  return METRICS.map((id) => `${id.split('-').map((w) => w[0]).join('').toUpperCase()} ${report.audits[id]?.displayValue ?? '?'}`).join(', ');
}

export async function benchLighthouse(input: { baseUrl: string; cookie: string; visitId: string; runs?: number }): Promise<void> {
  const runs = input.runs ?? 3;
  // The offline page is the app's lightest (a static page on the root layout, next to a bare Next
  // page): its score in the same run shows what the machine's load alone costs.
  const baselinePage = { name: 'offline_page', url: `${input.baseUrl}/offline`, cookie: null };
  const pages = [
    { name: 'sign_in', url: `${input.baseUrl}/sign-in`, cookie: null },
    { name: 'today_list', url: `${input.baseUrl}/field`, cookie: input.cookie },
    { name: 'visit_screen', url: `${input.baseUrl}/field/visits/${input.visitId}`, cookie: input.cookie },
  ];
  const results = new Map<string, Run[]>();
  // Round-robin, so a burst of load on the machine lands on every page rather than on one.
  for (let i = 0; i < runs; i++) {
    for (const page of [baselinePage, ...pages]) {
      const report = await lighthouse(page.url, page.cookie);
      results.set(page.name, [...(results.get(page.name) ?? []), { report, load: os.loadavg()[0]! }]);
    }
  }
  const scores = (name: string) => (results.get(name) ?? []).map((r) => r.report.categories.performance?.score ?? 0);
  const base = medianRun(results.get(baselinePage.name)!);
  const baseScore = base.report.categories.performance?.score ?? 0;
  console.log(`   baseline ${baselinePage.name}: performance ${baseScore.toFixed(2)} (runs ${scores(baselinePage.name).map((x) => x.toFixed(2)).join(', ')}; ${metricsLine(base.report)})`);
  const targets = { performance: 0.9, accessibility: 0.95, 'best-practices': 0.95 } as const;
  for (const page of pages) {
    const list = results.get(page.name)!;
    const mid = medianRun(list);
    for (const [category, min] of Object.entries(targets)) {
      const values = list.map((r) => r.report.categories[category]?.score ?? 0);
      const score = category === 'performance' ? (mid.report.categories.performance?.score ?? 0) : median(values);
      const perf = category === 'performance';
      record({
        name: `lighthouse.${page.name}.${category}`,
        value: score,
        unit: 'score',
        target: `≥ ${min}`,
        pass: score >= min,
        ...(perf ? { baseline: { name: 'offline page', value: baseScore, unit: 'score' }, ratio: baseScore ? score / baseScore : null } : {}),
        note: perf
          ? `median of ${list.length} (${values.map((x) => x.toFixed(2)).join(', ')}); ${metricsLine(mid.report)}; load average ${list.map((r) => r.load.toFixed(1)).join(' / ')}`
          : undefined,
      });
    }
  }
}
