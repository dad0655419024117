// The one place that reads process.env. Every setting is validated here; a bad or missing
// value stops start-up with a message naming it. Edit when the app gains a setting.
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { z } from 'zod';

const port = z.coerce.number().int().min(0).max(65535);
const LOCAL_PAYMENT_KEY = 'sk_test_hearthmark_local';
const LOCAL_WEBHOOK_SECRET = 'whsec_hearthmark_local';
const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);
const url = z.string().url();

const schema = z.object({
  HEARTHMARK_ENV: z.enum(['development', 'demo', 'test', 'production']).default('development'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'must start with postgres:// (leave unset for SQLite)')
    .optional(),
  DATABASE_FILE: z.string().min(1).default('data/hearthmark.db'),
  NEXTAUTH_URL: url.default('http://localhost:3000'),
  NEXTAUTH_SECRET: z.string().min(32, 'must be at least 32 characters').optional(),
  SESSION_MAX_AGE_S: z.coerce.number().int().min(300).max(60 * 60 * 24 * 30).default(60 * 60 * 12),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  SMTP_SECURE: z.enum(['true', 'false']).default('false'),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().min(3).default('Hearthmark <no-reply@hearthmark.test>'),
  /** Set only while the local mail fake is in use; enables the office mailbox page. */
  MAIL_FAKE_URL: url.optional(),
  STRIPE_SECRET_KEY: z.string().regex(/^(sk|rk)_(test|live)_\S{4,}$/, 'must be a secret key (sk_test_…, sk_live_…)').default(LOCAL_PAYMENT_KEY),
  STRIPE_WEBHOOK_SECRET: z.string().regex(/^whsec_\S{4,}$/, 'must be a webhook signing secret (whsec_…)').default(LOCAL_WEBHOOK_SECRET),
  /**
   * Where the payment API is. Outside production, unset means the local fake (127.0.0.1:12111 over
   * http). In production, leave host and port unset and the SDK reaches the hosted service over https.
   */
  STRIPE_API_HOST: z.string().min(1).optional(),
  STRIPE_API_PORT: port.optional(),
  STRIPE_API_PROTOCOL: z.enum(['http', 'https']).optional(),
  UPLOAD_DIR: z.string().min(1).default('data/uploads'),
  /** Where photos and PDFs live: `disk` under UPLOAD_DIR (one server), or `s3` (several servers). */
  STORAGE_DRIVER: z.enum(['disk', 's3']).default('disk'),
  /** Leave unset for AWS itself; set for another S3-compatible service (or the local fake). */
  S3_ENDPOINT: url.optional(),
  S3_BUCKET: z.string().min(3).max(63).regex(/^[a-z0-9][a-z0-9.-]+[a-z0-9]$/, 'must be a valid S3 bucket name').optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  /** Both unset: the SDK's own credential chain (instance role, shared config) is used. */
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  /** Most non-AWS services (and the local fake) need path-style addressing. */
  S3_FORCE_PATH_STYLE: z.enum(['true', 'false']).default('false'),
  CRON_ENABLED: z.enum(['true', 'false']).default('true'),
});

export type Env = Omit<z.infer<typeof schema>, 'STRIPE_API_PROTOCOL'> & { NEXTAUTH_SECRET: string; STRIPE_API_PROTOCOL: 'http' | 'https' };

/** Demo and development need no set-up: a secret is made once and kept in a git-ignored file. */
function generatedSecret(): string {
  const file = path.join(process.cwd(), '.secrets.json');
  try {
    const saved = JSON.parse(fs.readFileSync(file, 'utf8')) as { nextauthSecret?: string };
    if (saved.nextauthSecret && saved.nextauthSecret.length >= 32) return saved.nextauthSecret;
  } catch {
    // no file yet: make one below
  }
  const secret = crypto.randomBytes(32).toString('base64url');
  fs.writeFileSync(file, JSON.stringify({ nextauthSecret: secret }, null, 2), { mode: 0o600 });
  return secret;
}

export function loadEnv(source: Record<string, string | undefined> = process.env): Env {
  const parsed = schema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Hearthmark cannot start: bad settings\n${lines.join('\n')}`);
  }
  const value = parsed.data;
  if (!value.NEXTAUTH_SECRET && value.HEARTHMARK_ENV === 'production') {
    throw new Error('Hearthmark cannot start: bad settings\n  NEXTAUTH_SECRET: required in production');
  }
  if (value.STORAGE_DRIVER === 's3' && !value.S3_BUCKET) {
    throw new Error('Hearthmark cannot start: bad settings\n  S3_BUCKET: required when STORAGE_DRIVER=s3');
  }
  if (Boolean(value.S3_ACCESS_KEY_ID) !== Boolean(value.S3_SECRET_ACCESS_KEY)) {
    throw new Error('Hearthmark cannot start: bad settings\n  S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY: set both or neither');
  }
  return { ...value, ...paymentApi(value), NEXTAUTH_SECRET: value.NEXTAUTH_SECRET ?? generatedSecret() };
}

/**
 * The payment API endpoint. Demo and tests may only ever talk to the local fake with test keys, so no
 * code path there can reach the hosted service; production gets the hosted service unless told otherwise.
 */
function paymentApi(value: z.infer<typeof schema>): Pick<Env, 'STRIPE_API_HOST' | 'STRIPE_API_PORT' | 'STRIPE_API_PROTOCOL'> {
  const fail = (line: string): never => {
    throw new Error(`Hearthmark cannot start: bad settings\n  ${line}`);
  };
  if (value.HEARTHMARK_ENV === 'production') {
    if (value.STRIPE_SECRET_KEY === LOCAL_PAYMENT_KEY) fail('STRIPE_SECRET_KEY: required in production (the local test key is refused)');
    if (value.STRIPE_WEBHOOK_SECRET === LOCAL_WEBHOOK_SECRET) fail('STRIPE_WEBHOOK_SECRET: required in production (the local secret is refused)');
    return { STRIPE_API_HOST: value.STRIPE_API_HOST, STRIPE_API_PORT: value.STRIPE_API_PORT, STRIPE_API_PROTOCOL: value.STRIPE_API_PROTOCOL ?? 'https' };
  }
  const host = value.STRIPE_API_HOST ?? '127.0.0.1';
  if ((value.HEARTHMARK_ENV === 'demo' || value.HEARTHMARK_ENV === 'test') && !LOOPBACK.has(host)) {
    fail(`STRIPE_API_HOST: must be the local payment fake (127.0.0.1) in ${value.HEARTHMARK_ENV}, not ${host}`);
  }
  if (value.STRIPE_SECRET_KEY.includes('_live_')) fail(`STRIPE_SECRET_KEY: live keys are refused outside production`);
  return { STRIPE_API_HOST: host, STRIPE_API_PORT: value.STRIPE_API_PORT ?? 12111, STRIPE_API_PROTOCOL: value.STRIPE_API_PROTOCOL ?? 'http' };
}

let cached: Env | undefined;

/** Settings, validated on first use. */
export function env(): Env {
  if (!cached) {
    cached = loadEnv();
    // next-auth reads these two itself; keep them in step with what we validated.
    process.env.NEXTAUTH_URL = cached.NEXTAUTH_URL;
    process.env.NEXTAUTH_SECRET = cached.NEXTAUTH_SECRET;
  }
  return cached;
}

/** For tests that change settings between cases. */
export function resetEnvCache(): void {
  cached = undefined;
}
