// The server the Playwright tests use: a fresh demo database, fresh fakes and the built app on
// port 3100 (fakes on their own ports, so a running demo does not get in the way).
import fs from 'node:fs';
import { resetDatabase, startStack, type StackOptions } from './stack';

export const E2E_OPTIONS: StackOptions = {
  appPort: 3100,
  smtpPort: 2625,
  mailHttpPort: 2626,
  paymentPort: 12211,
  databaseFile: 'data/e2e.db',
  mailDir: 'data/e2e-mail',
  paymentStateFile: 'data/e2e-payments.json',
  uploadDir: 'data/e2e-uploads',
  hearthmarkEnv: 'test',
  quiet: true,
};

async function main() {
  for (const p of [E2E_OPTIONS.mailDir, E2E_OPTIONS.uploadDir, E2E_OPTIONS.paymentStateFile]) fs.rmSync(p, { recursive: true, force: true });
  await resetDatabase(E2E_OPTIONS);
  await startStack(E2E_OPTIONS);
  console.log('e2e stack ready on http://localhost:3100');
}

if (process.argv[1]?.endsWith('e2e-server.ts')) {
  main().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
