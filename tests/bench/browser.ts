// Browser figures with Playwright on Debian's Chromium: gzipped JavaScript the visit screen loads on
// first load against the offline page (the lightest page the app has, next to a bare Next page) in
// the same run, the service worker's precache size, and whether the PWA is installable (manifest +
// a registered service worker).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { chromium, type Browser, type BrowserContext } from '@playwright/test';
import { record } from './report';

export const CHROMIUM = { executablePath: '/usr/bin/chromium', args: ['--no-sandbox', '--disable-dev-shm-usage'] };

type Script = { url: string; bytes: number; gzipBytes: number };

export async function launch(): Promise<Browser> {
  return chromium.launch(CHROMIUM);
}

export async function sessionContext(browser: Browser, baseUrl: string, cookie: string | null, options: { serviceWorkers?: 'allow' | 'block' } = {}): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 412, height: 823 }, isMobile: true, hasTouch: true, serviceWorkers: options.serviceWorkers ?? 'allow' });
  if (cookie) {
    const [name, ...rest] = cookie.split('=');
    await context.addCookies([{ name: name!, value: rest.join('='), url: baseUrl, httpOnly: true, sameSite: 'Lax' }]);
  }
  return context;
}

/** Every script a first load (cold cache) fetches, with its size gzipped here at the default level. */
async function firstLoadScripts(context: BrowserContext, url: string): Promise<Script[]> {
  const page = await context.newPage();
  const pending: Array<Promise<Script | null>> = [];
  page.on('response', (res) => {
    if (res.request().resourceType() !== 'script') return;
    pending.push(
      res
        .body()
        .then((body) => ({ url: res.url(), bytes: body.length, gzipBytes: zlib.gzipSync(body).length }))
        .catch(() => null),
    );
  });
  const res = await page.goto(url, { waitUntil: 'networkidle' });
  if (!res || res.status() >= 400) throw new Error(`${url} answered ${res?.status()}`);
  const finalUrl = page.url();
  // Bodies are read before the page closes: a closed page's responses have none, and a script
  // dropped here would make the page look lighter than it is.
  const scripts = await Promise.all(pending);
  await page.close();
  if (new URL(finalUrl).pathname !== new URL(url).pathname) throw new Error(`${url} redirected to ${finalUrl}: not signed in?`);
  const lost = scripts.filter((s) => s === null).length;
  if (lost) throw new Error(`${url}: ${lost} scripts had no readable body`);
  return scripts.filter((s): s is Script => s !== null);
}

const kB = (n: number) => n / 1000;

export async function benchWeight(input: { browser: Browser; baseUrl: string; cookie: string; visitId: string; distDir?: string }): Promise<void> {
  // Cold loads with no service worker: its install would fetch the whole precache beside the page.
  const anonymous = await sessionContext(input.browser, input.baseUrl, null, { serviceWorkers: 'block' });
  const baseline = await firstLoadScripts(anonymous, `${input.baseUrl}/offline`);
  const signIn = await firstLoadScripts(anonymous, `${input.baseUrl}/sign-in`);
  await anonymous.close();
  const engineer = await sessionContext(input.browser, input.baseUrl, input.cookie, { serviceWorkers: 'block' });
  const today = await firstLoadScripts(engineer, `${input.baseUrl}/field`);
  const visit = await firstLoadScripts(engineer, `${input.baseUrl}/field/visits/${input.visitId}`);
  await engineer.close();
  const total = (list: Script[]) => list.reduce((a, s) => a + s.gzipBytes, 0);
  const value = kB(total(visit));
  const base = kB(total(baseline));
  const largest = [...visit].sort((a, b) => b.gzipBytes - a.gzipBytes).slice(0, 5).map((s) => `${path.basename(new URL(s.url).pathname)} ${kB(s.gzipBytes).toFixed(1)} kB`);
  record({
    name: 'weight.visit_screen_first_load_js_gzip',
    value,
    unit: 'kB',
    target: '≤ 230 kB',
    pass: value <= 230,
    baseline: { name: 'offline page (next to bare)', value: base, unit: 'kB' },
    ratio: value / base,
    note: `${visit.length} scripts (offline page ${baseline.length}); today list ${kB(total(today)).toFixed(0)} kB, sign-in ${kB(total(signIn)).toFixed(0)} kB; largest: ${largest.join(', ')}`,
  });
  if (input.distDir) checkFieldPrecached(input.distDir, [...baseline, ...today, ...visit]);
}

/**
 * The precache leaves out what only the office and portal load, so every script the field pages
 * and the offline page load must still be in it, or a visit would not open in a cellar.
 */
function checkFieldPrecached(distDir: string, scripts: Script[]): void {
  const { file } = builtWorkerFile(distDir);
  if (!fs.existsSync(file)) return;
  const listed = new Set(precacheUrls(fs.readFileSync(file, 'utf8')).map((u) => decodeURIComponent(u)));
  const loaded = [...new Set(scripts.map((s) => decodeURIComponent(new URL(s.url).pathname)))];
  const missing = loaded.filter((u) => !listed.has(u));
  record({
    name: 'pwa.field_scripts_precached',
    value: loaded.length - missing.length,
    unit: `of ${loaded.length} scripts`,
    target: 'all',
    pass: missing.length === 0,
    note: missing.length ? `not in ${file}: ${missing.join(', ')}` : `every script of /offline, /field and the visit screen is in ${file}`,
  });
}

/**
 * The worker this build registers: the client runtime names its URL (window.serwist = new
 * Serwist(origin + "/sw-….js")), so the figure never reads a worker another build left in public/.
 */
function builtWorkerFile(distDir: string): { file: string; how: string } {
  const fallback = distDir === '.next' ? 'sw.js' : `sw-${distDir.replace(/[^a-z0-9]+/gi, '')}.js`;
  try {
    const manifest = JSON.parse(fs.readFileSync(path.join(distDir, 'build-manifest.json'), 'utf8')) as { rootMainFiles?: string[] };
    for (const script of manifest.rootMainFiles ?? []) {
      const found = /location\.origin\s*\+\s*["'`]\/([\w.-]+\.js)["'`]/.exec(fs.readFileSync(path.join(distDir, script), 'utf8'));
      if (found) return { file: path.join('public', found[1]!), how: `named in ${path.basename(script)}` };
    }
  } catch {
    // no build manifest: fall through to the naming rule in next.config.mjs
  }
  return { file: path.join('public', fallback), how: 'by the naming rule' };
}

/** The precache list Serwist injected into the worker: every {revision, url} pair, whatever the quoting. */
export function precacheUrls(source: string): string[] {
  // Minified output quotes keys and values in ' or " (or escapes them when inlined as a string).
  const pair = /\\?['"]?url\\?['"]?\s*:\s*\\?['"`]([^'"`\\]+)\\?['"`]/g;
  return [...new Set([...source.matchAll(pair)].map((m) => m[1]!).filter((u) => u.startsWith('/')))];
}

/** The worker's precache list and the bytes it lists (built files, public files and prerendered pages). */
export function benchPrecache(input: { distDir: string }): void {
  const { file, how } = builtWorkerFile(input.distDir);
  if (!fs.existsSync(file)) {
    record({ name: 'weight.precache_total', value: NaN, unit: 'MB', target: '≤ 1.5 MB', pass: false, note: `no service worker at ${file} (${how}): this build has no Serwist worker (it needs \`next build --webpack\` with @serwist/next configured)` });
    return;
  }
  const builtAt = fs.statSync(path.join(input.distDir, 'BUILD_ID')).mtimeMs;
  const stale = fs.statSync(file).mtimeMs < builtAt - 60_000;
  const urls = precacheUrls(fs.readFileSync(file, 'utf8'));
  let bytes = 0;
  let gzipBytes = 0;
  const missing: string[] = [];
  const sizes: Array<[string, number]> = [];
  for (const url of urls) {
    // Route segments arrive URL-encoded ('%5Bid%5D' for '[id]'); the files are named plainly.
    const plain = decodeURIComponent(url.split('?')[0]!);
    const candidates = plain.startsWith('/_next/')
      ? [path.join(input.distDir, plain.slice('/_next/'.length))]
      : [path.join('public', plain), path.join(input.distDir, 'server', 'app', `${plain}.html`)];
    const local = candidates.find((c) => fs.existsSync(c) && !fs.statSync(c).isDirectory());
    if (!local) {
      missing.push(url);
      continue;
    }
    const body = fs.readFileSync(local);
    bytes += body.length;
    gzipBytes += zlib.gzipSync(body).length;
    sizes.push([url, body.length]);
  }
  const largest = sizes.sort((a, b) => b[1] - a[1]).slice(0, 5).map(([u, n]) => `${path.basename(u)} ${(n / 1000).toFixed(0)} kB`);
  const mb = bytes / 1e6;
  const scripts = sizes.filter(([u]) => u.endsWith('.js')).length;
  record({
    name: 'weight.precache_total',
    value: mb,
    unit: 'MB',
    target: '≤ 1.5 MB',
    pass: urls.length > 0 && mb <= 1.5,
    note: `${urls.length} entries (${scripts} scripts) in ${file} (${how}${stale ? ', OLDER than the build' : ''}), ${(gzipBytes / 1e6).toFixed(2)} MB gzipped${missing.length ? `; ${missing.length} not on disk (${missing.slice(0, 3).join(', ')})` : ''}; largest: ${largest.join(', ')}`,
  });
}

/** Installable: a linked manifest with name, icons and start_url, and a service worker that registers on /field. */
export async function checkInstallable(input: { browser: Browser; baseUrl: string; cookie: string }): Promise<void> {
  const context = await sessionContext(input.browser, input.baseUrl, input.cookie);
  const page = await context.newPage();
  await page.goto(`${input.baseUrl}/field`, { waitUntil: 'networkidle' });
  const manifestHref = await page.locator('link[rel="manifest"]').first().getAttribute('href').catch(() => null);
  let manifestOk = false;
  let manifestNote = 'no <link rel="manifest">';
  if (manifestHref) {
    const res = await page.request.get(new URL(manifestHref, input.baseUrl).toString());
    const m = (await res.json().catch(() => ({}))) as { name?: string; short_name?: string; start_url?: string; display?: string; icons?: Array<{ sizes?: string }> };
    const big = (m.icons ?? []).some((i) => (i.sizes ?? '').split(' ').some((s) => Number(s.split('x')[0]) >= 512));
    manifestOk = res.ok() && Boolean(m.name || m.short_name) && Boolean(m.start_url) && ['standalone', 'fullscreen', 'minimal-ui'].includes(m.display ?? '') && big;
    manifestNote = `manifest ${manifestHref}: name ${m.short_name ?? m.name}, display ${m.display}, start_url ${m.start_url}, 512 px icon ${big}`;
  }
  const sw = await page
    .evaluate(async () => {
      if (!('serviceWorker' in navigator)) return 'unsupported';
      const ready = await Promise.race([navigator.serviceWorker.ready.then((r) => r.active?.scriptURL ?? 'registered'), new Promise<string>((r) => setTimeout(() => r('none'), 15_000))]);
      return ready;
    })
    .catch((err: Error) => `error ${err.message}`);
  await context.close();
  const swOk = !['unsupported', 'none'].includes(sw) && !sw.startsWith('error');
  record({
    name: 'pwa.installable',
    value: manifestOk && swOk ? 1 : 0,
    unit: 'bool',
    target: 'manifest + service worker',
    pass: manifestOk && swOk,
    note: `${manifestNote}; service worker: ${sw}`,
  });
}
