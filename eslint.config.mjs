// ESLint flat config: Next's recommended rules (core web vitals + TypeScript). Edit to add a rule for the whole project.
import next from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';

const config = [
  ...next,
  ...nextTs,
  { ignores: ['.next/**', 'node_modules/**', 'public/**', 'tests/bench/results/**', 'data/**', 'next-env.d.ts', 'test-results/**', 'playwright-report/**'] },
];

export default config;
