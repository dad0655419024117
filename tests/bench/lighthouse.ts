// Page quality with Lighthouse 12 (mobile defaults, its CLI on Debian's Chromium): performance,
// accessibility and best practices for the sign-in page, the engineer's today list and the visit
// screen, the last two signed in through the session cookie in extraHeaders.
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

export async function benchLighthouse(input: { baseUrl: string; cookie: string; visitId: string }): Promise<void> {
  const pages = [
    { name: 'sign_in', url: `${input.baseUrl}/sign-in`, cookie: null },
    { name: 'today_list', url: `${input.baseUrl}/field`, cookie: input.cookie },
    { name: 'visit_screen', url: `${input.baseUrl}/field/visits/${input.visitId}`, cookie: input.cookie },
  ];
  const targets = { performance: 0.9, accessibility: 0.95, 'best-practices': 0.95 } as const;
  for (const page of pages) {
    const report = await lighthouse(page.url, page.cookie);
    const metrics = ['first-contentful-paint', 'largest-contentful-paint', 'total-blocking-time', 'cumulative-layout-shift']
      .map((id) => `${id.split('-').map((w) => w[0]).join('').toUpperCase()} ${report.audits[id]?.displayValue ?? '?'}`)
      .join(', ');
    for (const [category, min] of Object.entries(targets)) {
      const score = report.categories[category]?.score ?? 0;
      record({
        name: `lighthouse.${page.name}.${category}`,
        value: score,
        unit: 'score',
        target: `≥ ${min}`,
        pass: score >= min,
        note: category === 'performance' ? `${metrics}; load average ${os.loadavg()[0]!.toFixed(1)}` : undefined,
      });
    }
  }
}
