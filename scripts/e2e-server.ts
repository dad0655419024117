// The server the Playwright tests use: a fresh demo database, fresh fakes and the built app on
// port 3100 (fakes on their own ports, so a running demo does not get in the way).
import fs from 'node:fs';
import { resetDatabase, startStack, type StackOptions } from './stack';

// E2E_PORT_OFFSET moves every port (and the data files) so two e2e runs can share a machine.
const offset = Number(process.env.E2E_PORT_OFFSET ?? 0);
const tag = offset ? `e2e${offset}` : 'e2e';

export const E2E_OPTIONS: StackOptions = {
  appPort: 3100 + offset,
  smtpPort: 2625 + offset,
  mailHttpPort: 2626 + offset,
  paymentPort: 12211 + offset,
  databaseFile: `data/${tag}.db`,
  mailDir: `data/${tag}-mail`,
  paymentStateFile: `data/${tag}-payments.json`,
  uploadDir: `data/${tag}-uploads`,
  hearthmarkEnv: 'test',
  quiet: true,
};

async function main() {
  for (const p of [E2E_OPTIONS.mailDir, E2E_OPTIONS.uploadDir, E2E_OPTIONS.paymentStateFile]) fs.rmSync(p, { recursive: true, force: true });
  await resetDatabase(E2E_OPTIONS);
  await startStack(E2E_OPTIONS);
  console.log(`e2e stack ready on http://localhost:${E2E_OPTIONS.appPort}`);
}

if (process.argv[1]?.endsWith('e2e-server.ts')) {
  main().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
