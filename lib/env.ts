// The one place that reads process.env. Every setting is validated here; a bad or missing
// value stops start-up with a message naming it. Edit when the app gains a setting.
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { z } from 'zod';

const port = z.coerce.number().int().min(0).max(65535);
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
  STRIPE_SECRET_KEY: z.string().min(8).default('sk_test_hearthmark_local'),
  STRIPE_WEBHOOK_SECRET: z.string().min(8).default('whsec_hearthmark_local'),
  /** Host of the payment API; the local fake by default. Unset both to reach the hosted service. */
  STRIPE_API_HOST: z.string().optional().default('127.0.0.1'),
  STRIPE_API_PORT: port.optional().default(12111),
  STRIPE_API_PROTOCOL: z.enum(['http', 'https']).default('http'),
  UPLOAD_DIR: z.string().min(1).default('data/uploads'),
  CRON_ENABLED: z.enum(['true', 'false']).default('true'),
});

export type Env = z.infer<typeof schema> & { NEXTAUTH_SECRET: string };

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
  return { ...value, NEXTAUTH_SECRET: value.NEXTAUTH_SECRET ?? generatedSecret() };
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
