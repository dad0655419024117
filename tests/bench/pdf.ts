// Certificate PDF: median render of a 4-appliance certificate against a one-page, 40-line
// react-pdf document rendered in the same process and run (same fonts). Runs as a child process
// with the bench stack's settings; the documents themselves are in pdf-documents.tsx.
import os from 'node:os';
import path from 'node:path';
import type { CertificateContent } from '@/lib/certificates/types';
import { benchKnex } from './stack';
import { median, record, writeFigures } from './report';

type Documents = typeof import('./pdf-documents');

/**
 * @react-pdf's packages are ESM-only (exports with an "import" condition only), which tsx's
 * CommonJS transform cannot require; jiti resolves them, with 'server-only' mapped to its empty
 * export as Next's server does. seeds/05-demo-certificates.ts loads the issuing code the same way.
 */
async function loadDocuments(): Promise<Documents> {
  const { createJiti } = await import('jiti');
  const root = process.cwd();
  const jiti = createJiti(path.join(root, 'tests/bench/pdf.ts'), {
    alias: { '@': root, 'server-only': path.join(root, 'node_modules/server-only/empty.js') },
    jsx: { runtime: 'automatic' },
    tryNative: false,
    fsCache: false,
  });
  return jiti.import<Documents>(path.join(root, 'tests/bench/pdf-documents.tsx'));
}

/** The issued demo certificate with the most appliances, made up to four by repeating them with new ids. */
async function fourApplianceContent(databaseFile: string): Promise<CertificateContent> {
  const knex = benchKnex(databaseFile);
  try {
    const rows = (await knex('certificates').select('content_json')) as Array<{ content_json: string }>;
    if (rows.length === 0) throw new Error('no issued certificate in the bench database to take content from');
    const contents = rows.map((r) => JSON.parse(r.content_json) as CertificateContent);
    const richest = contents.sort((a, b) => b.appliances.length - a.appliances.length)[0]!;
    const appliances = Array.from({ length: 4 }, (_, i) => {
      const source = richest.appliances[i % richest.appliances.length]!;
      if (i < richest.appliances.length) return source;
      return { ...source, applianceId: `${source.applianceId.slice(0, -4)}${String(i).padStart(4, '0')}`, location: `${source.location} (${i + 1})` };
    });
    return { ...richest, appliances };
  } finally {
    await knex.destroy();
  }
}

function pages(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
}

async function main(): Promise<void> {
  const [databaseFile, roundsArg, smokeArg, figuresFile] = process.argv.slice(2);
  const rounds = Number(roundsArg ?? 15);
  const content = await fourApplianceContent(databaseFile!);
  const { renderBaselinePdf, renderCertificatePdf } = await loadDocuments();
  // Warm-up: font parsing and module initialisation are paid once per process, not per certificate.
  await renderBaselinePdf();
  const warm = await renderCertificatePdf(content);
  const baseline: number[] = [];
  const certificate: number[] = [];
  // Process CPU time beside the wall time: on a shared machine the wall time of one render can be
  // stretched several-fold by other work, its CPU time much less.
  const baselineCpu: number[] = [];
  const certificateCpu: number[] = [];
  const cpuMs = (since: NodeJS.CpuUsage) => {
    const used = process.cpuUsage(since);
    return (used.user + used.system) / 1000;
  };
  for (let i = 0; i < rounds; i++) {
    // Interleaved so a burst of load from elsewhere hits both series alike.
    let t = performance.now();
    let cpu = process.cpuUsage();
    await renderBaselinePdf();
    baseline.push(performance.now() - t);
    baselineCpu.push(cpuMs(cpu));
    t = performance.now();
    cpu = process.cpuUsage();
    await renderCertificatePdf(content);
    certificate.push(performance.now() - t);
    certificateCpu.push(cpuMs(cpu));
  }
  const b = median(baseline);
  const c = median(certificate);
  const bCpu = median(baselineCpu);
  const cCpu = median(certificateCpu);
  record({
    name: 'pdf.certificate_4_appliances_median',
    value: c,
    unit: 'ms',
    target: '≤ 3× one-page baseline',
    pass: smokeArg === 'smoke' ? null : c <= 3 * b,
    baseline: { name: 'one-page 40-line document', value: b, unit: 'ms' },
    ratio: c / b,
    note:
      `${rounds} rounds each; certificate ${pages(warm)} pages, ${(warm.length / 1024).toFixed(0)} kB, including its QR code; ` +
      'baseline 1 page of 40 Text lines in the same registered Lato fonts (font files parsed in the warm-up for both); ' +
      `median process CPU ${cCpu.toFixed(0)} vs ${bCpu.toFixed(0)} ms (ratio ${(cCpu / bCpu).toFixed(2)}); load average ${os.loadavg()[0]!.toFixed(1)}`,
  });
  writeFigures(figuresFile!);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
