// ESLint flat config: Next's recommended rules (core web vitals + TypeScript). Edit to add a rule for the whole project.
import next from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';

const config = [
  ...next,
  ...nextTs,
  {
    rules: {
      // TanStack Table (our chosen table library) returns fresh functions by design; the React
      // Compiler just skips those components, which is fine for lists of this size.
      'react-hooks/incompatible-library': 'off',
    },
  },
  { ignores: ['.next/**', 'node_modules/**', 'public/**', 'tests/bench/results/**', 'data/**', 'next-env.d.ts', 'test-results/**', 'playwright-report/**', '.next-*/**'] },
];

export default config;
