// Benchmark results: one printed line per figure — `name: value unit (target …, baseline …, ratio …) PASS|MISS`
// — and the same as JSON in tests/bench/results/latest.json (git-ignored).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

export type Figure = {
  name: string;
  value: number;
  unit: string;
  /** Human-readable target, e.g. "≤ 250 ms" or "≥ 0.5× baseline". */
  target: string;
  pass: boolean | null;
  baseline?: { name: string; value: number; unit: string } | null;
  ratio?: number | null;
  note?: string;
};

const figures: Figure[] = [];

function fmt(n: number): string {
  if (!Number.isFinite(n)) return String(n);
  if (Math.abs(n) >= 100) return n.toFixed(0);
  if (Math.abs(n) >= 10) return n.toFixed(1);
  return n.toFixed(2);
}

export function record(figure: Figure): void {
  figures.push(figure);
  const parts = [`target ${figure.target}`];
  if (figure.baseline) parts.push(`baseline ${figure.baseline.name} ${fmt(figure.baseline.value)} ${figure.baseline.unit}`);
  if (figure.ratio !== undefined && figure.ratio !== null) parts.push(`ratio ${fmt(figure.ratio)}`);
  const verdict = figure.pass === null ? 'INFO' : figure.pass ? 'PASS' : 'MISS';
  console.log(`${figure.name}: ${fmt(figure.value)} ${figure.unit} (${parts.join(', ')}) ${verdict}${figure.note ? ` — ${figure.note}` : ''}`);
}

export function writeResults(extra: Record<string, unknown> = {}): string {
  const dir = path.join(process.cwd(), 'tests/bench/results');
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, 'latest.json');
  const machine = { cpus: os.cpus().length, cpuModel: os.cpus()[0]?.model ?? 'unknown', memoryGiB: Math.round(os.totalmem() / 2 ** 30), node: process.version };
  fs.writeFileSync(file, JSON.stringify({ at: new Date().toISOString(), machine, figures, ...extra }, null, 2));
  return file;
}

/** For a benchmark run as a child process: hand its figures to the parent through a file. */
export function writeFigures(file: string): void {
  fs.writeFileSync(file, JSON.stringify(figures));
}

/** Takes in a child's figures (already printed by the child) so they reach latest.json. */
export function adoptFigures(file: string): void {
  if (fs.existsSync(file)) figures.push(...(JSON.parse(fs.readFileSync(file, 'utf8')) as Figure[]));
}

export function allFigures(): readonly Figure[] {
  return figures;
}

export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

export function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))];
}
