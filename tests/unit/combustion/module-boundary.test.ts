// lib/combustion must run in the browser, on the server and in a plain Node script (STYLE.md rule 5),
// so nothing in it may import from outside the folder, and index.ts exposes a fixed set of names.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import * as combustion from '../../../lib/combustion';

const LIB_DIR = fileURLToPath(new URL('../../../lib/combustion/', import.meta.url));

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return sourceFiles(full);
    return /\.(ts|tsx|js|mjs|cjs)$/.test(name) ? [full] : [];
  });
}

// Static imports, re-exports, side-effect imports, dynamic import() and require().
const SPECIFIER_PATTERNS = [
  /\bfrom\s*['"]([^'"]+)['"]/g,
  /\bimport\s*['"]([^'"]+)['"]/g,
  /\bimport\s*\(\s*['"`]([^'"`]+)['"`]\s*\)/g,
  /\brequire\s*\(\s*['"`]([^'"`]+)['"`]\s*\)/g,
];

function specifiers(source: string): string[] {
  return SPECIFIER_PATTERNS.flatMap((pattern) => [...source.matchAll(pattern)].map((match) => match[1]));
}

describe('lib/combustion module boundary', () => {
  const files = sourceFiles(LIB_DIR);

  it('has source files to check', () => {
    expect(files.map((f) => path.basename(f))).toContain('index.ts');
    expect(files.length).toBeGreaterThan(3);
  });

  it.each(files.map((f) => [path.relative(LIB_DIR, f), f]))('%s imports only files inside lib/combustion', (_name, file) => {
    const source = readFileSync(file, 'utf8');
    for (const specifier of specifiers(source)) {
      expect(specifier, `import '${specifier}'`).toMatch(/^\.\.?\//);
      const resolved = path.resolve(path.dirname(file), specifier);
      expect(resolved.startsWith(LIB_DIR), `import '${specifier}' leaves the folder`).toBe(true);
    }
    // Belt and braces against framework, database and alias imports that a pattern above might miss.
    for (const forbidden of ["'next", "'react", "'@/", "'knex", "'better-sqlite3", "'server-only", "'node:", "'fs'", 'process.env']) {
      expect(source.includes(forbidden), `${forbidden} in ${path.basename(file)}`).toBe(false);
    }
    expect(/\bimport\s*\(/.test(source), 'dynamic import').toBe(false);
    expect(/\brequire\s*\(/.test(source), 'require()').toBe(false);
  });

  it('the import check itself catches an outside import', () => {
    expect(specifiers("import { z } from 'zod';\nexport * from '@/lib/limits';")).toEqual(['zod', '@/lib/limits']);
  });

  it('index exports exactly the agreed runtime names', () => {
    expect(Object.keys(combustion).sort()).toEqual(
      [
        'CombustionInputError',
        'FUEL_IDS',
        'FUEL_LABELS',
        'airFreeCoFromCo2',
        'airFreeCoFromO2',
        'analyseFlueGas',
        'cToF',
        'co2FromO2',
        'co2MaxForFuel',
        'co2MaxFromComposition',
        'coCo2Ratio',
        'excessAirPct',
        'fToC',
        'flueLossPct',
        'heatInputKw',
        'isFuelId',
        'lambdaFromO2',
        'ppmToMgPerM3',
      ].sort(),
    );
  });
});
