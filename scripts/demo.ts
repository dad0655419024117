// `npm run demo`: build the app, migrate and seed the demo scenario, start the fakes and the app
// on http://localhost:3000, and print the demo accounts. Ctrl+C stops everything.
import fs from 'node:fs';
import path from 'node:path';
import { resetDatabase, runToEnd, startStack, type StackOptions } from './stack';
import { DEMO_ACCOUNTS } from '../seeds/demo-support';

const options: StackOptions = {
  appPort: Number(process.env.PORT ?? 3000),
  smtpPort: 2525,
  mailHttpPort: 2526,
  paymentPort: 12111,
  databaseFile: 'data/demo.db',
  mailDir: 'data/demo-mail',
  paymentStateFile: 'data/demo-payments.json',
  uploadDir: 'data/demo-uploads',
  hearthmarkEnv: 'demo',
};

async function main() {
  const skipBuild = process.argv.includes('--no-build') && fs.existsSync(path.join('.next', 'BUILD_ID'));
  if (!skipBuild) {
    console.log('Building the app (a few minutes on a 2-core machine)…');
    // --webpack: the field app's service worker is built by @serwist/next's webpack plugin.
    await runToEnd(path.join('node_modules', '.bin', 'next'), ['build', '--webpack'], {});
  }
  console.log('Migrating and seeding the demo scenario…');
  fs.rmSync(options.mailDir, { recursive: true, force: true });
  fs.rmSync(options.paymentStateFile, { force: true });
  await resetDatabase(options);
  await startStack(options);
  const url = `http://localhost:${options.appPort}`;
  const lines = DEMO_ACCOUNTS.filter((a) => a.org !== 'other').map((a) =>
    `  ${a.role.padEnd(10)} ${a.email.padEnd(32)} ${a.password ? `password: ${a.password}` : 'sign in with an e-mail link (read it in the office’s Test mailbox)'}`,
  );
  console.log(
    [
      '',
      `Hearthmark demo is running at ${url}`,
      '',
      'Demo accounts (all invented):',
      ...lines,
      '',
      `Local mail service: SMTP 127.0.0.1:${options.smtpPort}, messages at ${url}/office/mailbox (office account)`,
      `Local payment service: http://127.0.0.1:${options.paymentPort}  test cards 4242 4242 4242 4242 (pays), 4000 0000 0000 0002 (declined)`,
      'Press Ctrl+C to stop.',
    ].join('\n'),
  );
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
