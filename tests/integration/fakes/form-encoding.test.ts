import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { parseFormBody, splitKey } from '../../../scripts/fakes/form-encoding';

describe('parseFormBody', () => {
  it('folds bracket keys into nested objects and arrays', () => {
    const body =
      'mode=payment&line_items[0][price_data][currency]=gbp&line_items[0][price_data][unit_amount]=7500' +
      '&line_items[0][price_data][product_data][name]=Boiler+service&line_items[0][quantity]=1' +
      '&line_items[1][price_data][product_data][name]=Flue%20check%20%26%20CO%20test&line_items[1][quantity]=2' +
      '&metadata[invoiceId]=inv_42&expand[]=line_items&expand[]=payment_intent';
    expect(parseFormBody(body)).toEqual({
      mode: 'payment',
      line_items: [
        { price_data: { currency: 'gbp', unit_amount: '7500', product_data: { name: 'Boiler service' } }, quantity: '1' },
        { price_data: { product_data: { name: 'Flue check & CO test' } }, quantity: '2' },
      ],
      metadata: { invoiceId: 'inv_42' },
      expand: ['line_items', 'payment_intent'],
    });
  });

  it('accepts percent-encoded brackets and sparse indexes', () => {
    expect(parseFormBody('expand%5B0%5D=a&expand%5B3%5D=b&x%5By%5D%5Bz%5D=1')).toEqual({ expand: ['a', 'b'], x: { y: { z: '1' } } });
  });

  it('keeps numeric metadata keys as keys and refuses prototype keys', () => {
    const parsed = parseFormBody('metadata[0]=zero&metadata[1]=one&__proto__[polluted]=1&a[constructor][prototype][p]=1');
    expect(parsed).toEqual({ metadata: { '0': 'zero', '1': 'one' } });
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('survives malformed input', () => {
    expect(parseFormBody('a=%E0%A4%A&b&=c&d[=1&e]=2&f=1=2')).toEqual({ a: '%E0%A4%A', b: '', 'e]': '2', f: '1=2' });
    expect(splitKey('a[b]c')).toBeNull();
  });

  it('round-trips the body the SDK itself sends', async () => {
    // Capture a real request body rather than re-implementing the SDK's encoder here.
    let captured = '';
    const server = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        captured = Buffer.concat(chunks).toString('utf8');
        res.writeHead(200, { 'content-type': 'application/json' }).end('{"id":"cs_test_x","object":"checkout.session"}');
      });
    });
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    const { port } = server.address() as AddressInfo;
    const params = {
      mode: 'payment' as const,
      customer_email: 'a+b@example.test',
      success_url: 'http://127.0.0.1:3000/paid?session={CHECKOUT_SESSION_ID}&x=1',
      line_items: [
        { price_data: { currency: 'gbp', unit_amount: 1250, product_data: { name: "Landlord's cert (CP12) — 100%" } }, quantity: 3 },
        { price_data: { currency: 'gbp', unit_amount: 0, product_data: { name: 'Call-out [waived]' } }, quantity: 1 },
      ],
      payment_intent_data: { metadata: { invoiceId: 'inv 1/2', org: 'org_1' } },
      expand: ['line_items'],
    };
    try {
      const sdk = new Stripe('sk_test_capture', { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
      await sdk.checkout.sessions.create(params);
    } finally {
      await new Promise<void>((resolve) => server.close(() => resolve()));
    }
    expect(captured).toContain('line_items[0][price_data][currency]=gbp');
    const numbersAsStrings = JSON.parse(JSON.stringify(params, (_k, v: unknown) => (typeof v === 'number' ? String(v) : v))) as unknown;
    expect(parseFormBody(captured)).toEqual(numbersAsStrings);
  });
});
