// lib/env's payment settings: the local fake unless configured otherwise; demo and tests can never
// reach the hosted service; production reaches it with real keys and no host setting.
import { describe, expect, it } from 'vitest';
import { loadEnv } from '@/lib/env';

const base = { NEXTAUTH_SECRET: 'x'.repeat(40) };

describe('payment API settings', () => {
  it('default to the local fake over http', () => {
    const e = loadEnv({ ...base, HEARTHMARK_ENV: 'test' });
    expect([e.STRIPE_API_HOST, e.STRIPE_API_PORT, e.STRIPE_API_PROTOCOL]).toEqual(['127.0.0.1', 12111, 'http']);
  });

  it('refuse any other host, and live keys, in demo and tests', () => {
    expect(() => loadEnv({ ...base, HEARTHMARK_ENV: 'demo', STRIPE_API_HOST: 'api.stripe.com' })).toThrow(/STRIPE_API_HOST: must be the local payment fake/);
    expect(() => loadEnv({ ...base, HEARTHMARK_ENV: 'test', STRIPE_SECRET_KEY: 'sk_live_abcdefgh' })).toThrow(/live keys are refused/);
  });

  it('in production leave host and port to the SDK (hosted service over https) and need real secrets', () => {
    const e = loadEnv({ ...base, HEARTHMARK_ENV: 'production', STRIPE_SECRET_KEY: 'sk_live_realkey1234', STRIPE_WEBHOOK_SECRET: 'whsec_realsecret' });
    expect([e.STRIPE_API_HOST, e.STRIPE_API_PORT, e.STRIPE_API_PROTOCOL]).toEqual([undefined, undefined, 'https']);
    expect(() => loadEnv({ ...base, HEARTHMARK_ENV: 'production' })).toThrow(/STRIPE_SECRET_KEY: required in production/);
  });

  it('name a malformed key', () => {
    expect(() => loadEnv({ ...base, STRIPE_SECRET_KEY: 'not-a-key' })).toThrow(/STRIPE_SECRET_KEY: must be a secret key/);
  });
});
