// Starts the local mail and payment fakes for the demo and e2e tests: `npx tsx scripts/fakes/run-fakes.ts`.
// Settings come from the environment (defaults below); edit when a fake gains an option.
import { startMailFake, type MailFake } from './mail-fake';
import { DEFAULT_SECRET_KEY, DEFAULT_WEBHOOK_SECRET, DEFAULT_WEBHOOK_URL, startPaymentFake, type PaymentFake } from './payment-fake';

function fail(message: string): never {
  console.error(`[fakes] ${message}`);
  process.exit(1);
}

function port(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0 || value > 65535) fail(`${name} must be a port number from 0 to 65535, got "${raw}"`);
  return value;
}

function text(name: string, fallback: string): string {
  return process.env[name] ?? fallback;
}

const settings = {
  mail: {
    smtpPort: port('MAIL_FAKE_SMTP_PORT', 2525),
    httpPort: port('MAIL_FAKE_HTTP_PORT', 2526),
    dir: text('MAIL_FAKE_DIR', 'data/mail') || fail('MAIL_FAKE_DIR must not be empty'),
  },
  payment: {
    port: port('PAYMENT_FAKE_PORT', 12111),
    secretKey: text('PAYMENT_FAKE_SECRET_KEY', DEFAULT_SECRET_KEY),
    // Set to an empty string to record events without sending them.
    webhookUrl: text('PAYMENT_FAKE_WEBHOOK_URL', DEFAULT_WEBHOOK_URL),
    webhookSecret: text('PAYMENT_FAKE_WEBHOOK_SECRET', DEFAULT_WEBHOOK_SECRET),
    // Kept by default so a demo restart does not orphan the app's stored session ids; empty disables.
    stateFile: text('PAYMENT_FAKE_STATE_FILE', 'data/payment-fake-state.json'),
  },
};

if (!settings.payment.secretKey.startsWith('sk_')) fail('PAYMENT_FAKE_SECRET_KEY must start with sk_');
if (!settings.payment.webhookSecret.startsWith('whsec_')) fail('PAYMENT_FAKE_WEBHOOK_SECRET must start with whsec_');
if (settings.payment.webhookUrl) {
  try {
    new URL(settings.payment.webhookUrl);
  } catch {
    fail(`PAYMENT_FAKE_WEBHOOK_URL is not a URL: "${settings.payment.webhookUrl}"`);
  }
}

async function main(): Promise<void> {
  const running: (MailFake | PaymentFake)[] = [];
  const stopAll = async (): Promise<void> => {
    await Promise.allSettled(running.map((fake) => fake.close()));
  };
  try {
    running.push(await startMailFake(settings.mail));
    running.push(await startPaymentFake(settings.payment));
  } catch (error) {
    await stopAll();
    fail(`could not start: ${(error as Error).message}`);
  }
  console.log('[fakes] ready');

  let stopping = false;
  const stop = (signal: string): void => {
    if (stopping) return;
    stopping = true;
    console.log(`[fakes] ${signal}: stopping`);
    void stopAll().then(() => process.exit(0));
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

void main();
