// Tailwind settings read through `@config` in app/globals.css. Colour tokens live in `@theme`
// there; this file only says which files hold class names.
import type { Config } from 'tailwindcss';

const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
};

export default config;
