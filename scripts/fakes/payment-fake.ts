// Local fake of the hosted card-payment API that the official `stripe` SDK talks to: customers,
// Checkout Sessions, payment intents, refunds, a hosted pay page and signed webhooks. Demo and tests only.
// Edit when the app starts using another endpoint or field; keep object shapes close to the real API.
import { randomBytes } from 'node:crypto';
import { mkdir, readFile, rename, writeFile } from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import Stripe from 'stripe';
import { parseFormBody, type FormObject, type FormValue } from './form-encoding';
import { PAGE_TITLE, TEST_CARD_HINT, renderCheckoutPage, renderMessagePage, type CheckoutView } from './payment-fake-page';

export const DEFAULT_SECRET_KEY = 'sk_test_hearthmark_local';
export const DEFAULT_WEBHOOK_SECRET = 'whsec_hearthmark_local';
export const DEFAULT_WEBHOOK_URL = 'http://127.0.0.1:3000/api/v1/payments/webhook';
export const TEST_CARDS = { succeeds: '4242424242424242', declined: '4000000000000002' } as const;

export interface PaymentFakeOptions {
  /** 0 picks a free port; read the bound one from the result. */
  port?: number;
  host?: string;
  secretKey?: string;
  /** null or '' records events without sending them. */
  webhookUrl?: string | null;
  webhookSecret?: string;
  /** Delays before each retry of a failed webhook; its length is the retry count. */
  webhookRetryDelaysMs?: number[];
  /** How long the pay page waits for the first webhook attempt before answering the browser. */
  webhookWaitMs?: number;
  /** When set, state is loaded from and saved to this JSON file. */
  stateFile?: string | null;
  log?: (line: string) => void;
}

export interface PaymentFake {
  port: number;
  baseUrl: string;
  events(): EventRecord[];
  close(): Promise<void>;
}

type Metadata = Record<string, string>;

export interface CustomerObject {
  id: string;
  object: 'customer';
  address: null;
  balance: number;
  created: number;
  currency: null;
  default_source: null;
  delinquent: boolean;
  description: string | null;
  email: string | null;
  invoice_prefix: string;
  invoice_settings: { custom_fields: null; default_payment_method: null; footer: null; rendering_options: null };
  livemode: false;
  metadata: Metadata;
  name: string | null;
  next_invoice_sequence: number;
  phone: string | null;
  preferred_locales: string[];
  shipping: null;
  tax_exempt: 'none';
  test_clock: null;
}

export interface LineItemObject {
  id: string;
  object: 'item';
  amount_discount: number;
  amount_subtotal: number;
  amount_tax: number;
  amount_total: number;
  currency: string;
  description: string;
  price: {
    id: string;
    object: 'price';
    active: boolean;
    billing_scheme: 'per_unit';
    created: number;
    currency: string;
    livemode: false;
    metadata: Metadata;
    product: string;
    type: 'one_time';
    unit_amount: number;
    unit_amount_decimal: string;
  };
  quantity: number;
}

export interface CheckoutSessionObject {
  id: string;
  object: 'checkout.session';
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer: string | null;
  customer_details: { address: null; email: string | null; name: string | null; phone: null; tax_exempt: 'none'; tax_ids: [] } | null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  locale: string | null;
  metadata: Metadata;
  mode: 'payment';
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: 'unpaid' | 'paid';
  status: 'open' | 'complete' | 'expired';
  success_url: string;
  ui_mode: 'hosted';
  url: string | null;
}

interface LastPaymentError {
  type: 'card_error';
  code: 'card_declined';
  decline_code: 'generic_decline';
  message: string;
  charge: string;
  payment_method: { id: string; object: 'payment_method'; type: 'card' };
}

export interface PaymentIntentObject {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_capturable: number;
  amount_received: number;
  canceled_at: null;
  cancellation_reason: null;
  capture_method: 'automatic_async';
  client_secret: string;
  confirmation_method: 'automatic';
  created: number;
  currency: string;
  customer: string | null;
  description: string | null;
  last_payment_error: LastPaymentError | null;
  latest_charge: string | null;
  livemode: false;
  metadata: Metadata;
  payment_method: string | null;
  payment_method_types: string[];
  receipt_email: string | null;
  status: 'requires_payment_method' | 'succeeded';
}

export interface ChargeObject {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  balance_transaction: null;
  billing_details: { address: null; email: string | null; name: string | null; phone: null };
  captured: boolean;
  created: number;
  currency: string;
  customer: string | null;
  description: string | null;
  failure_code: string | null;
  failure_message: string | null;
  livemode: false;
  metadata: Metadata;
  outcome: { network_status: string; reason: string | null; risk_level: 'normal'; seller_message: string; type: 'authorized' | 'issuer_declined' };
  paid: boolean;
  payment_intent: string;
  payment_method: string;
  payment_method_details: { type: 'card'; card: { brand: string; country: 'GB'; exp_month: number; exp_year: number; funding: 'credit'; last4: string } };
  receipt_url: null;
  refunded: boolean;
  status: 'succeeded' | 'failed';
}

export interface RefundObject {
  id: string;
  object: 'refund';
  amount: number;
  balance_transaction: null;
  charge: string;
  created: number;
  currency: string;
  metadata: Metadata;
  payment_intent: string;
  reason: string | null;
  receipt_number: null;
  status: 'succeeded';
}

export interface EventObject {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

export interface EventRecord {
  event: EventObject;
  delivery: { status: 'pending' | 'delivered' | 'failed' | 'disabled'; attempts: { at: string; status?: number; error?: string }[] };
}

/** The API request that caused an event; null for events caused on the pay page. */
interface EventRequest {
  id: string | null;
  idempotencyKey: string | null;
}

interface SessionRecord {
  session: CheckoutSessionObject;
  lineItems: LineItemObject[];
  paymentIntentData: { metadata: Metadata; description: string | null };
}

interface PersistedState {
  version: 1;
  customers: CustomerObject[];
  sessions: SessionRecord[];
  paymentIntents: PaymentIntentObject[];
  charges: ChargeObject[];
  refunds: RefundObject[];
  events: EventRecord[];
}

class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly extra: { param?: string; code?: string; type?: string } = {},
  ) {
    super(message);
  }
}

const now = (): number => Math.floor(Date.now() / 1000);
const BASE62 = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

function randomId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = prefix;
  for (const byte of bytes) out += BASE62[byte % 62];
  return out;
}

const clone = <T>(value: T): T => structuredClone(value);

// ---------- parameter readers: each error names the offending param the way the real API does ----------

function missingParam(param: string): ApiError {
  return new ApiError(400, `Missing required param: ${param}.`, { param, code: 'parameter_missing' });
}

/** Typed reads from a parsed body; `prefix` makes nested errors say e.g. `line_items[0][quantity]`. */
class Params {
  constructor(
    readonly values: FormObject,
    readonly prefix = '',
  ) {}

  path(name: string): string {
    return this.prefix ? `${this.prefix}[${name}]` : name;
  }

  has(name: string): boolean {
    return this.values[name] !== undefined;
  }

  string(name: string): string | undefined {
    const value = this.values[name];
    if (value === undefined) return undefined;
    if (typeof value !== 'string') throw new ApiError(400, `Invalid string: ${this.path(name)} must be a string`, { param: this.path(name) });
    return value;
  }

  /** Empty counts as absent, as the real API treats `param=` for optional ids. */
  id(name: string): string | null {
    return this.string(name) || null;
  }

  requiredString(name: string): string {
    const value = this.string(name);
    if (value === undefined || value === '') throw missingParam(this.path(name));
    return value;
  }

  integer(name: string, range: { min: number; max?: number }): number | undefined {
    const raw = this.string(name);
    if (raw === undefined) return undefined;
    const param = this.path(name);
    if (!/^-?\d+$/.test(raw) || !Number.isSafeInteger(Number(raw))) {
      throw new ApiError(400, `Invalid integer: ${raw}`, { param, code: 'parameter_invalid_integer' });
    }
    const value = Number(raw);
    if (value < range.min) throw new ApiError(400, `This value must be greater than or equal to ${range.min}.`, { param, code: 'parameter_invalid_integer' });
    if (range.max !== undefined && value > range.max) throw new ApiError(400, `This value must be less than or equal to ${range.max}.`, { param, code: 'parameter_invalid_integer' });
    return value;
  }

  requiredInteger(name: string, range: { min: number }): number {
    const value = this.integer(name, range);
    if (value === undefined) throw missingParam(this.path(name));
    return value;
  }

  object(name: string): Params | undefined {
    const value = this.values[name];
    if (value === undefined || value === '') return undefined;
    if (typeof value !== 'object' || Array.isArray(value)) throw new ApiError(400, `Invalid object: ${this.path(name)}`, { param: this.path(name) });
    return new Params(value, this.path(name));
  }

  requiredObject(name: string): Params {
    const value = this.object(name);
    if (!value) throw missingParam(this.path(name));
    return value;
  }

  url(name: string): string | undefined {
    const value = this.string(name);
    if (value === undefined) return undefined;
    try {
      const url = new URL(value.replace(/\{CHECKOUT_SESSION_ID\}/g, 'x'));
      if (url.protocol === 'http:' || url.protocol === 'https:') return value;
    } catch {
      // reported below
    }
    throw new ApiError(400, 'Not a valid URL', { param: this.path(name), code: 'url_invalid' });
  }

  /** Metadata values are strings; on update an empty string deletes the key, as in the real API. */
  metadataInto(target: Metadata, name = 'metadata'): Metadata {
    const value = this.object(name);
    if (!value) return target;
    for (const [key, entry] of Object.entries(value.values)) {
      if (typeof entry !== 'string') throw new ApiError(400, `Invalid string: ${value.path(key)}`, { param: value.path(key) });
      if (entry === '') delete target[key];
      else target[key] = entry;
    }
    return target;
  }

  expandPaths(): string[] {
    const value: FormValue | undefined = this.values.expand;
    if (value === undefined) return [];
    const list = Array.isArray(value) ? value : [value];
    return list.map((entry, i) => {
      if (typeof entry !== 'string') throw new ApiError(400, 'Invalid array', { param: `expand[${i}]` });
      return entry;
    });
  }
}

/** Newest first, cursor by id, like the real list endpoints. */
function listOf<T extends { id: string }>(view: { items: T[]; url: string; params: Params }) {
  const limit = view.params.integer('limit', { min: 1, max: 100 }) ?? 10;
  const startingAfter = view.params.string('starting_after');
  const newestFirst = [...view.items].reverse().map((item) => clone(item));
  const start = startingAfter ? newestFirst.findIndex((item) => item.id === startingAfter) + 1 : 0;
  return { object: 'list', data: newestFirst.slice(start, start + limit), has_more: start + limit < newestFirst.length, url: view.url };
}

async function readBody(req: http.IncomingMessage, maxBytes: number): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > maxBytes) throw new ApiError(413, 'Request body too large');
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

function sendJson(res: http.ServerResponse, reply: { status: number; body: unknown }): void {
  const payload = JSON.stringify(reply.body, null, 2);
  res.writeHead(reply.status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(payload) });
  res.end(payload);
}

function sendApiError(res: http.ServerResponse, error: ApiError): void {
  const { type = 'invalid_request_error', code, param } = error.extra;
  sendJson(res, { status: error.status, body: { error: { type, message: error.message, ...(code ? { code } : {}), ...(param ? { param } : {}) } } });
}

function sendHtml(res: http.ServerResponse, page: { status: number; html: string }): void {
  res.writeHead(page.status, {
    'content-type': 'text/html; charset=utf-8',
    'content-length': Buffer.byteLength(page.html),
    // No form-action here: browsers apply it to the redirect to success_url too.
    'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; frame-ancestors 'none'",
    'cache-control': 'no-store',
  });
  res.end(page.html);
}

export async function startPaymentFake(options: PaymentFakeOptions = {}): Promise<PaymentFake> {
  const host = options.host ?? '127.0.0.1';
  const secretKey = options.secretKey ?? DEFAULT_SECRET_KEY;
  const webhookUrl = options.webhookUrl === undefined ? DEFAULT_WEBHOOK_URL : options.webhookUrl || null;
  const webhookSecret = options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET;
  const retryDelays = options.webhookRetryDelaysMs ?? [500, 1500, 4000];
  const webhookWaitMs = options.webhookWaitMs ?? 2000;
  const stateFile = options.stateFile ? path.resolve(options.stateFile) : null;
  const log = options.log ?? ((line: string) => console.log(`[payment-fake] ${line}`));

  const customers = new Map<string, CustomerObject>();
  const sessions = new Map<string, SessionRecord>();
  const paymentIntents = new Map<string, PaymentIntentObject>();
  const charges = new Map<string, ChargeObject>();
  const refunds = new Map<string, RefundObject>();
  const events = new Map<string, EventRecord>();
  // Replays a POST with the same Idempotency-Key instead of creating a second object.
  const idempotent = new Map<string, { status: number; body: unknown }>();

  if (stateFile) await loadState(stateFile);

  async function loadState(file: string): Promise<void> {
    let raw: string;
    try {
      raw = await readFile(file, 'utf8');
    } catch {
      return;
    }
    try {
      const state = JSON.parse(raw) as PersistedState;
      for (const c of state.customers) customers.set(c.id, c);
      for (const s of state.sessions) sessions.set(s.session.id, s);
      for (const p of state.paymentIntents) paymentIntents.set(p.id, p);
      for (const c of state.charges) charges.set(c.id, c);
      for (const r of state.refunds) refunds.set(r.id, r);
      for (const e of state.events) {
        // Retries do not survive a restart; say so rather than leave them "pending" forever.
        if (e.delivery.status === 'pending') e.delivery.status = 'failed';
        events.set(e.event.id, e);
      }
      log(`loaded state from ${file}: ${sessions.size} sessions, ${events.size} events`);
    } catch (error) {
      log(`ignoring unreadable state file ${file}: ${(error as Error).message}`);
    }
  }

  let writeChain: Promise<void> = Promise.resolve();
  let writeQueued = false;
  function persist(): void {
    if (!stateFile || writeQueued) return;
    writeQueued = true;
    // Coalesce bursts of changes into one write; writes never overlap.
    writeChain = writeChain
      .then(async () => {
        writeQueued = false;
        const state: PersistedState = {
          version: 1,
          customers: [...customers.values()],
          sessions: [...sessions.values()],
          paymentIntents: [...paymentIntents.values()],
          charges: [...charges.values()],
          refunds: [...refunds.values()],
          events: [...events.values()],
        };
        await mkdir(path.dirname(stateFile), { recursive: true });
        await writeFile(`${stateFile}.tmp`, JSON.stringify(state));
        await rename(`${stateFile}.tmp`, stateFile);
      })
      .catch((error: Error) => log(`could not save state: ${error.message}`));
  }

  // ---------- webhooks ----------

  let closed = false;
  const retryTimers = new Set<NodeJS.Timeout>();
  const inflight = new AbortController();

  async function attemptDelivery(record: EventRecord): Promise<boolean> {
    if (!webhookUrl) return false;
    const payload = JSON.stringify(record.event, null, 2);
    const signature = Stripe.webhooks.generateTestHeaderString({ payload, secret: webhookSecret });
    const at = new Date().toISOString();
    try {
      const res = await fetch(webhookUrl, {
        method: 'POST',
        headers: { 'content-type': 'application/json; charset=utf-8', 'stripe-signature': signature, 'user-agent': 'HearthmarkPaymentFake/1.0' },
        body: payload,
        signal: AbortSignal.any([inflight.signal, AbortSignal.timeout(10_000)]),
      });
      await res.text();
      record.delivery.attempts.push({ at, status: res.status });
      if (res.ok) return true;
      log(`webhook ${record.event.type} ${record.event.id} got HTTP ${res.status} from ${webhookUrl}`);
    } catch (error) {
      const message = (error as Error).cause instanceof Error ? ((error as Error).cause as Error).message : (error as Error).message;
      record.delivery.attempts.push({ at, error: message });
      log(`webhook ${record.event.type} ${record.event.id} could not reach ${webhookUrl}: ${message}`);
    }
    return false;
  }

  /** Starts delivery with retries; the promise settles after the first attempt only. */
  function deliver(record: EventRecord): Promise<void> {
    if (!webhookUrl) {
      record.delivery.status = 'disabled';
      return Promise.resolve();
    }
    record.delivery.status = 'pending';
    return new Promise<void>((firstAttemptDone) => {
      const run = async (attempt: number): Promise<void> => {
        if (closed) return;
        const ok = await attemptDelivery(record);
        if (ok) record.delivery.status = 'delivered';
        else if (attempt >= retryDelays.length || closed) {
          record.delivery.status = 'failed';
          log(`webhook ${record.event.type} ${record.event.id} failed after ${attempt + 1} attempts`);
        } else {
          const timer = setTimeout(() => {
            retryTimers.delete(timer);
            void run(attempt + 1);
          }, retryDelays[attempt]);
          retryTimers.add(timer);
        }
        persist();
        if (attempt === 0) firstAttemptDone();
      };
      void run(0);
    });
  }

  function emit(what: { type: string; object: unknown; request?: EventRequest }): Promise<void> {
    const { type, object, request = { id: null, idempotencyKey: null } } = what;
    const event: EventObject = {
      id: randomId('evt_'),
      object: 'event',
      api_version: Stripe.API_VERSION,
      created: now(),
      data: { object: clone(object) },
      livemode: false,
      pending_webhooks: webhookUrl ? 1 : 0,
      request: { id: request.id, idempotency_key: request.idempotencyKey },
      type,
    };
    const record: EventRecord = { event, delivery: { status: 'pending', attempts: [] } };
    events.set(event.id, record);
    persist();
    return deliver(record);
  }

  /** Lets the browser wait briefly so the app usually has the webhook before the redirect lands. */
  async function waitBriefly(first: Promise<void>): Promise<void> {
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([first, new Promise<void>((resolve) => (timer = setTimeout(resolve, webhookWaitMs)))]);
    clearTimeout(timer);
  }

  // ---------- lookups and expansion ----------

  function notFound(what: { kind: string; id: string; param?: string; status?: number }): ApiError {
    return new ApiError(what.status ?? 404, `No such ${what.kind}: '${what.id}'`, { param: what.param ?? 'id', code: 'resource_missing' });
  }

  function lookupById(id: string): unknown {
    if (id.startsWith('cus_')) return customers.get(id);
    if (id.startsWith('pi_')) return paymentIntents.get(id);
    if (id.startsWith('ch_')) return charges.get(id);
    if (id.startsWith('re_')) return refunds.get(id);
    if (id.startsWith('cs_')) return sessions.get(id)?.session;
    return undefined;
  }

  /** Replaces ids named by `expand` paths (e.g. `payment_intent.latest_charge`) with their objects. */
  function expand(object: Record<string, unknown>, paths: string[]): Record<string, unknown> {
    const out: Record<string, unknown> = { ...object };
    const byField = new Map<string, string[]>();
    for (const p of paths) {
      const [field, ...rest] = p.split('.');
      byField.set(field, [...(byField.get(field) ?? []), ...(rest.length ? [rest.join('.')] : [])]);
    }
    for (const [field, rest] of byField) {
      if (field === 'line_items' && out.object === 'checkout.session') {
        const record = sessions.get(out.id as string);
        out.line_items = { object: 'list', data: clone(record?.lineItems ?? []), has_more: false, url: `/v1/checkout/sessions/${String(out.id)}/line_items` };
        continue;
      }
      const value = out[field];
      if (value === null) continue;
      const target = typeof value === 'string' ? lookupById(value) : undefined;
      if (!target || typeof target !== 'object') throw new ApiError(400, `This property cannot be expanded (${field}).`, { param: 'expand' });
      out[field] = expand(clone(target) as Record<string, unknown>, rest);
    }
    return out;
  }

  function respond(object: object, params: Params): Record<string, unknown> {
    return expand(clone(object) as Record<string, unknown>, params.expandPaths());
  }

  // ---------- API handlers ----------

  function createCustomer(params: Params): CustomerObject {
    const customer: CustomerObject = {
      id: randomId('cus_', 14),
      object: 'customer',
      address: null,
      balance: 0,
      created: now(),
      currency: null,
      default_source: null,
      delinquent: false,
      description: params.id('description'),
      email: params.id('email'),
      invoice_prefix: randomId('', 8).toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: params.metadataInto({}),
      name: params.id('name'),
      next_invoice_sequence: 1,
      phone: params.id('phone'),
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
    customers.set(customer.id, customer);
    return customer;
  }

  function updateCustomer(id: string, params: Params): CustomerObject {
    const customer = customers.get(id);
    if (!customer) throw notFound({ kind: 'customer', id });
    for (const field of ['description', 'email', 'name', 'phone'] as const) {
      if (params.has(field)) customer[field] = params.id(field);
    }
    params.metadataInto(customer.metadata);
    return customer;
  }

  function readLineItem(item: Params, created: number): LineItemObject {
    if (item.has('price')) {
      throw new ApiError(400, 'This local fake supports only price_data line items, not saved prices.', { param: item.path('price') });
    }
    const priceData = item.requiredObject('price_data');
    const currency = priceData.requiredString('currency').toLowerCase();
    if (!/^[a-z]{3}$/.test(currency)) throw new ApiError(400, `Invalid currency: ${currency}`, { param: priceData.path('currency') });
    const unitAmount = priceData.requiredInteger('unit_amount', { min: 0 });
    const name = priceData.requiredObject('product_data').requiredString('name');
    const quantity = item.requiredInteger('quantity', { min: 1 });
    const amount = unitAmount * quantity;
    return {
      id: randomId('li_'),
      object: 'item',
      amount_discount: 0,
      amount_subtotal: amount,
      amount_tax: 0,
      amount_total: amount,
      currency,
      description: name,
      price: {
        id: randomId('price_'),
        object: 'price',
        active: false,
        billing_scheme: 'per_unit',
        created,
        currency,
        livemode: false,
        metadata: {},
        product: randomId('prod_', 14),
        type: 'one_time',
        unit_amount: unitAmount,
        unit_amount_decimal: String(unitAmount),
      },
      quantity,
    };
  }

  function readLineItems(params: Params, created: number): LineItemObject[] {
    const raw = params.values.line_items;
    if (raw === undefined || raw === '' || (Array.isArray(raw) && raw.length === 0)) throw missingParam('line_items');
    if (!Array.isArray(raw)) throw new ApiError(400, 'Invalid array', { param: 'line_items' });
    return raw.map((entry, i) => {
      if (typeof entry !== 'object' || Array.isArray(entry)) throw new ApiError(400, 'Invalid object', { param: `line_items[${i}]` });
      return readLineItem(new Params(entry, `line_items[${i}]`), created);
    });
  }

  function createSession(params: Params, baseUrl: string): CheckoutSessionObject {
    const mode = params.requiredString('mode');
    if (mode !== 'payment') throw new ApiError(400, `This local fake supports only mode=payment, not ${mode}.`, { param: 'mode' });
    const successUrl = params.url('success_url');
    if (!successUrl) throw missingParam('success_url');
    const customerId = params.id('customer');
    const customerEmail = params.id('customer_email');
    if (customerId && customerEmail) {
      throw new ApiError(400, 'You may only specify one of these parameters: customer, customer_email.', { param: 'customer_email' });
    }
    if (customerId && !customers.get(customerId)) throw notFound({ kind: 'customer', id: customerId, param: 'customer', status: 400 });
    const created = now();
    const lineItems = readLineItems(params, created);
    const currency = lineItems[0].currency;
    const other = lineItems.findIndex((item) => item.currency !== currency);
    if (other !== -1) throw new ApiError(400, 'All line items must use the same currency.', { param: `line_items[${other}][price_data][currency]` });
    const amountTotal = lineItems.reduce((sum, item) => sum + item.amount_total, 0);
    const intentData = params.object('payment_intent_data');
    const id = randomId('cs_test_', 58);
    const session: CheckoutSessionObject = {
      id,
      object: 'checkout.session',
      amount_subtotal: amountTotal,
      amount_total: amountTotal,
      cancel_url: params.url('cancel_url') ?? null,
      client_reference_id: params.id('client_reference_id'),
      created,
      currency,
      customer: customerId,
      customer_details: null,
      customer_email: customerEmail,
      expires_at: created + 24 * 60 * 60,
      livemode: false,
      locale: params.id('locale'),
      metadata: params.metadataInto({}),
      mode: 'payment',
      payment_intent: null,
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      status: 'open',
      success_url: successUrl,
      ui_mode: 'hosted',
      url: `${baseUrl}/pay/${id}`,
    };
    sessions.set(id, {
      session,
      lineItems,
      paymentIntentData: { metadata: intentData?.metadataInto({}) ?? {}, description: intentData?.id('description') ?? null },
    });
    return session;
  }

  function findSession(id: string): SessionRecord {
    const record = sessions.get(id);
    if (!record) throw notFound({ kind: 'checkout.session', id });
    return record;
  }

  function expireSession(id: string): CheckoutSessionObject {
    const { session } = findSession(id);
    if (session.status !== 'open') {
      throw new ApiError(400, `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".`, {
        param: 'session',
      });
    }
    session.status = 'expired';
    session.url = null;
    void emit({ type: 'checkout.session.expired', object: session });
    return session;
  }

  function refundableCharge(params: Params): { intent: PaymentIntentObject; charge: ChargeObject } {
    const intentId = params.id('payment_intent');
    const chargeId = params.id('charge');
    if (!intentId && !chargeId) {
      throw new ApiError(400, 'One of the following params should be provided for this request: payment_intent or charge.', { param: 'payment_intent', code: 'parameter_missing' });
    }
    let charge: ChargeObject | undefined;
    if (chargeId) {
      charge = charges.get(chargeId);
      if (!charge) throw notFound({ kind: 'charge', id: chargeId, param: 'charge', status: 400 });
    } else if (intentId) {
      const intent = paymentIntents.get(intentId);
      if (!intent) throw notFound({ kind: 'payment_intent', id: intentId, param: 'payment_intent', status: 400 });
      if (intent.status !== 'succeeded' || !intent.latest_charge) {
        throw new ApiError(400, `This PaymentIntent (${intent.id}) does not have a successful charge to refund.`, { param: 'payment_intent', code: 'charge_not_refundable' });
      }
      charge = charges.get(intent.latest_charge);
    }
    if (!charge || charge.status !== 'succeeded') {
      throw new ApiError(400, `Charge ${chargeId ?? ''} has not succeeded and cannot be refunded.`, { param: 'charge', code: 'charge_not_refundable' });
    }
    const intent = paymentIntents.get(charge.payment_intent) as PaymentIntentObject;
    return { intent, charge };
  }

  function createRefund(params: Params, request: EventRequest): RefundObject {
    const { intent, charge } = refundableCharge(params);
    const remaining = charge.amount - charge.amount_refunded;
    const requested = params.integer('amount', { min: 1 });
    if (remaining <= 0) {
      throw new ApiError(400, `Charge ${charge.id} has already been refunded.`, { code: 'charge_already_refunded' });
    }
    if (requested !== undefined && requested > remaining) {
      throw new ApiError(400, `Refund amount (${requested}) is greater than unrefunded amount on charge (${remaining}).`, { param: 'amount', code: 'amount_too_large' });
    }
    const amount = requested ?? remaining;
    const refund: RefundObject = {
      id: randomId('re_'),
      object: 'refund',
      amount,
      balance_transaction: null,
      charge: charge.id,
      created: now(),
      currency: charge.currency,
      metadata: params.metadataInto({}),
      payment_intent: intent.id,
      reason: params.id('reason'),
      receipt_number: null,
      status: 'succeeded',
    };
    refunds.set(refund.id, refund);
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded >= charge.amount;
    void emit({ type: 'charge.refunded', object: charge, request });
    return refund;
  }

  function retrieve<T extends object>(what: { kind: string; map: Map<string, T> }): Handler {
    return ({ params, match }) => {
      const found = what.map.get(match[1]);
      if (!found) throw notFound({ kind: what.kind, id: match[1] });
      return respond(found, params);
    };
  }

  type Handler = (ctx: { params: Params; match: RegExpExecArray; request: EventRequest; baseUrl: string }) => unknown;
  const routes: { method: string; pattern: RegExp; handler: Handler }[] = [
    { method: 'POST', pattern: /^\/v1\/customers$/, handler: ({ params }) => respond(createCustomer(params), params) },
    {
      method: 'GET',
      pattern: /^\/v1\/customers$/,
      handler: ({ params }) => {
        const email = params.string('email');
        return listOf({ items: [...customers.values()].filter((c) => !email || c.email === email), url: '/v1/customers', params });
      },
    },
    { method: 'GET', pattern: /^\/v1\/customers\/([^/]+)$/, handler: retrieve({ kind: 'customer', map: customers }) },
    { method: 'POST', pattern: /^\/v1\/customers\/([^/]+)$/, handler: ({ params, match }) => respond(updateCustomer(match[1], params), params) },
    { method: 'POST', pattern: /^\/v1\/checkout\/sessions$/, handler: ({ params, baseUrl }) => respond(createSession(params, baseUrl), params) },
    {
      method: 'GET',
      pattern: /^\/v1\/checkout\/sessions$/,
      handler: ({ params }) => {
        const intent = params.string('payment_intent');
        const customer = params.string('customer');
        const items = [...sessions.values()].map((r) => r.session).filter((s) => (!intent || s.payment_intent === intent) && (!customer || s.customer === customer));
        return listOf({ items, url: '/v1/checkout/sessions', params });
      },
    },
    { method: 'GET', pattern: /^\/v1\/checkout\/sessions\/([^/]+)$/, handler: ({ params, match }) => respond(findSession(match[1]).session, params) },
    {
      method: 'GET',
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/,
      // listOf shows newest first; line items keep the order they were given in.
      handler: ({ params, match }) => listOf({ items: [...findSession(match[1]).lineItems].reverse(), url: `/v1/checkout/sessions/${match[1]}/line_items`, params }),
    },
    { method: 'POST', pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/, handler: ({ params, match }) => respond(expireSession(match[1]), params) },
    { method: 'GET', pattern: /^\/v1\/payment_intents\/([^/]+)$/, handler: retrieve({ kind: 'payment_intent', map: paymentIntents }) },
    { method: 'GET', pattern: /^\/v1\/charges\/([^/]+)$/, handler: retrieve({ kind: 'charge', map: charges }) },
    { method: 'POST', pattern: /^\/v1\/refunds$/, handler: ({ params, request }) => respond(createRefund(params, request), params) },
    {
      method: 'GET',
      pattern: /^\/v1\/refunds$/,
      handler: ({ params }) => {
        const intent = params.string('payment_intent');
        const charge = params.string('charge');
        const items = [...refunds.values()].filter((r) => (!intent || r.payment_intent === intent) && (!charge || r.charge === charge));
        return listOf({ items, url: '/v1/refunds', params });
      },
    },
    { method: 'GET', pattern: /^\/v1\/refunds\/([^/]+)$/, handler: retrieve({ kind: 'refund', map: refunds }) },
  ];

  function checkAuth(req: http.IncomingMessage): void {
    const header = req.headers.authorization ?? '';
    let match = /^Bearer\s+(\S+)$/i.exec(header);
    // `curl -u sk_test_...:` sends the key as a Basic user name; the real API accepts that too.
    const basic = /^Basic\s+(\S+)$/i.exec(header);
    if (!match && basic) match = /^([^:]+):?/.exec(Buffer.from(basic[1], 'base64').toString('utf8'));
    if (!match) {
      throw new ApiError(401, "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').");
    }
    if (match[1] !== secretKey) {
      const shown = match[1].length > 12 ? `${match[1].slice(0, 8)}${'*'.repeat(8)}${match[1].slice(-4)}` : match[1];
      throw new ApiError(401, `Invalid API Key provided: ${shown}`);
    }
  }

  async function handleApi(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<void> {
    const requestId = randomId('req_', 14);
    res.setHeader('request-id', requestId);
    const method = req.method ?? 'GET';
    try {
      checkAuth(req);
      const route = routes.find((r) => r.method === method && r.pattern.test(url.pathname));
      if (!route) {
        throw new ApiError(404, `Unrecognized request URL (${method}: ${url.pathname}). This local fake implements only the endpoints the app uses.`);
      }
      const body = method === 'POST' ? await readBody(req, 1024 * 1024) : '';
      const contentType = req.headers['content-type'] ?? '';
      if (body && !contentType.startsWith('application/x-www-form-urlencoded')) {
        throw new ApiError(400, `Invalid request: bodies must be application/x-www-form-urlencoded, not ${contentType || 'missing'}.`);
      }
      const params = new Params({ ...parseFormBody(url.search.slice(1)), ...parseFormBody(body) });
      const rawKey = req.headers['idempotency-key'];
      const idempotencyKey = typeof rawKey === 'string' && rawKey ? rawKey : null;
      const cacheKey = idempotencyKey && method === 'POST' ? `${url.pathname}\n${idempotencyKey}` : null;
      const replay = cacheKey ? idempotent.get(cacheKey) : undefined;
      if (replay) {
        res.setHeader('idempotent-replayed', 'true');
        sendJson(res, replay);
        return;
      }
      const match = route.pattern.exec(url.pathname) as RegExpExecArray;
      const result = await route.handler({ params, match, request: { id: requestId, idempotencyKey }, baseUrl });
      if (method === 'POST') persist();
      if (cacheKey) idempotent.set(cacheKey, { status: 200, body: result });
      sendJson(res, { status: 200, body: result });
    } catch (error) {
      if (error instanceof ApiError) sendApiError(res, error);
      else throw error;
    }
  }

  // ---------- hosted checkout page ----------

  function checkoutPage(record: SessionRecord, extra: { status: number; notice?: CheckoutView['notice']; cardNumber?: string }) {
    const { session, lineItems } = record;
    const html = renderCheckoutPage({
      sessionId: session.id,
      amountTotal: session.amount_total,
      currency: session.currency,
      lineItems: lineItems.map((item) => ({ name: item.description, quantity: item.quantity, amountTotal: item.amount_total })),
      cancelUrl: session.cancel_url,
      notice: extra.notice,
      cardNumber: extra.cardNumber,
    });
    return { status: extra.status, html };
  }

  function successRedirect(session: CheckoutSessionObject): string {
    return session.success_url.replace(/\{CHECKOUT_SESSION_ID\}/g, session.id);
  }

  /** The page for a session that can no longer be paid, or null while it is open. */
  function closedPage(session: CheckoutSessionObject): { status: number; html: string } | null {
    if (session.status === 'complete') {
      return {
        status: 409,
        html: renderMessagePage({
          heading: 'Already paid',
          text: 'This payment is already paid. Nothing more to do.',
          link: { href: successRedirect(session), label: 'Return to the site' },
        }),
      };
    }
    if (session.status === 'expired') {
      return {
        status: 410,
        html: renderMessagePage({
          heading: 'Payment link expired',
          text: 'This payment link has expired. Ask for a new one.',
          ...(session.cancel_url ? { link: { href: session.cancel_url, label: 'Return to the site' } } : {}),
        }),
      };
    }
    return null;
  }

  function ensurePaymentIntent(record: SessionRecord): PaymentIntentObject {
    const { session } = record;
    const existing = session.payment_intent ? paymentIntents.get(session.payment_intent) : undefined;
    if (existing) return existing;
    const id = randomId('pi_');
    const intent: PaymentIntentObject = {
      id,
      object: 'payment_intent',
      amount: session.amount_total,
      amount_capturable: 0,
      amount_received: 0,
      canceled_at: null,
      cancellation_reason: null,
      capture_method: 'automatic_async',
      client_secret: `${id}_secret_${randomId('', 25)}`,
      confirmation_method: 'automatic',
      created: now(),
      currency: session.currency,
      customer: session.customer,
      description: record.paymentIntentData.description,
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata: { ...record.paymentIntentData.metadata },
      payment_method: null,
      payment_method_types: ['card'],
      receipt_email: null,
      status: 'requires_payment_method',
    };
    paymentIntents.set(id, intent);
    session.payment_intent = id;
    return intent;
  }

  function createCharge(attempt: { intent: PaymentIntentObject; session: CheckoutSessionObject; card: string; succeeded: boolean }): ChargeObject {
    const { intent, session, card, succeeded } = attempt;
    const customer = session.customer ? customers.get(session.customer) : undefined;
    const charge: ChargeObject = {
      id: randomId('ch_'),
      object: 'charge',
      amount: intent.amount,
      amount_captured: succeeded ? intent.amount : 0,
      amount_refunded: 0,
      balance_transaction: null,
      billing_details: { address: null, email: session.customer_email ?? customer?.email ?? null, name: customer?.name ?? null, phone: null },
      captured: succeeded,
      created: now(),
      currency: intent.currency,
      customer: intent.customer,
      description: intent.description,
      failure_code: succeeded ? null : 'card_declined',
      failure_message: succeeded ? null : 'Your card was declined.',
      livemode: false,
      // Copied from the payment intent so refund webhooks can be matched to an invoice.
      metadata: { ...intent.metadata },
      outcome: succeeded
        ? { network_status: 'approved_by_network', reason: null, risk_level: 'normal', seller_message: 'Payment complete.', type: 'authorized' }
        : { network_status: 'declined_by_network', reason: 'generic_decline', risk_level: 'normal', seller_message: 'The bank did not return any further details with this decline.', type: 'issuer_declined' },
      paid: succeeded,
      payment_intent: intent.id,
      payment_method: randomId('pm_'),
      payment_method_details: { type: 'card', card: { brand: 'visa', country: 'GB', exp_month: 12, exp_year: new Date().getFullYear() + 3, funding: 'credit', last4: card.slice(-4) } },
      receipt_url: null,
      refunded: false,
      status: succeeded ? 'succeeded' : 'failed',
    };
    charges.set(charge.id, charge);
    return charge;
  }

  async function handlePay(req: http.IncomingMessage, res: http.ServerResponse, sessionId: string): Promise<void> {
    const record = sessions.get(sessionId);
    if (!record) {
      sendHtml(res, { status: 404, html: renderMessagePage({ heading: 'Payment not found', text: 'There is no payment with this link.' }) });
      return;
    }
    if (req.method === 'GET') {
      sendHtml(res, closedPage(record.session) ?? checkoutPage(record, { status: 200 }));
      return;
    }
    if (req.method !== 'POST') {
      sendHtml(res, { status: 405, html: renderMessagePage({ heading: PAGE_TITLE, text: `${req.method ?? ''} is not supported here.` }) });
      return;
    }
    const form = parseFormBody(await readBody(req, 64 * 1024));
    const closed = closedPage(record.session);
    if (closed) {
      sendHtml(res, closed);
      return;
    }
    const entered = typeof form.card_number === 'string' ? form.card_number : '';
    const card = entered.replace(/[\s-]/g, '');
    if (card !== TEST_CARDS.succeeds && card !== TEST_CARDS.declined) {
      sendHtml(res, checkoutPage(record, { status: 422, notice: { kind: 'error', text: `${TEST_CARD_HINT}.` }, cardNumber: entered }));
      return;
    }
    const { session } = record;
    const intent = ensurePaymentIntent(record);
    if (card === TEST_CARDS.declined) {
      const charge = createCharge({ intent, session, card, succeeded: false });
      intent.status = 'requires_payment_method';
      intent.latest_charge = charge.id;
      intent.payment_method = null;
      intent.last_payment_error = {
        type: 'card_error',
        code: 'card_declined',
        decline_code: 'generic_decline',
        message: 'Your card was declined.',
        charge: charge.id,
        payment_method: { id: charge.payment_method, object: 'payment_method', type: 'card' },
      };
      persist();
      await waitBriefly(emit({ type: 'payment_intent.payment_failed', object: intent }));
      sendHtml(res, checkoutPage(record, { status: 402, notice: { kind: 'error', text: 'Your card was declined. Try another card; nothing was charged.' }, cardNumber: entered }));
      return;
    }
    const charge = createCharge({ intent, session, card, succeeded: true });
    intent.status = 'succeeded';
    intent.amount_received = intent.amount;
    intent.latest_charge = charge.id;
    intent.payment_method = charge.payment_method;
    intent.last_payment_error = null;
    session.status = 'complete';
    session.payment_status = 'paid';
    session.url = null;
    session.customer_details = { address: null, email: charge.billing_details.email, name: charge.billing_details.name, phone: null, tax_exempt: 'none', tax_ids: [] };
    persist();
    await waitBriefly(emit({ type: 'checkout.session.completed', object: session }));
    res.writeHead(303, { location: successRedirect(session), 'cache-control': 'no-store' });
    res.end();
  }

  // ---------- test helpers ----------

  function fakeNotFound(res: http.ServerResponse, message: string): void {
    sendJson(res, { status: 404, body: { error: { type: 'invalid_request_error', message } } });
  }

  async function handleFake(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<void> {
    const method = req.method ?? 'GET';
    if (method === 'GET' && url.pathname === '/_fake/health') {
      sendJson(res, { status: 200, body: { ok: true } });
      return;
    }
    if (method === 'GET' && url.pathname === '/_fake/events') {
      const type = url.searchParams.get('type');
      const data = [...events.values()].filter((e) => !type || e.event.type === type).reverse();
      sendJson(res, { status: 200, body: { object: 'list', data } });
      return;
    }
    const resend = /^\/_fake\/resend\/([^/]+)$/.exec(url.pathname);
    if (method === 'POST' && resend) {
      const record = events.get(resend[1]);
      if (!record) {
        fakeNotFound(res, `No such event: '${resend[1]}'`);
        return;
      }
      await deliver(record);
      sendJson(res, { status: 200, body: record });
      return;
    }
    if (method === 'POST' && url.pathname === '/_fake/reset') {
      for (const map of [customers, sessions, paymentIntents, charges, refunds, events, idempotent]) map.clear();
      persist();
      sendJson(res, { status: 200, body: { ok: true } });
      return;
    }
    fakeNotFound(res, `Unrecognized request URL (${method}: ${url.pathname}).`);
  }

  async function route(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
    // Parsed here, inside the promise, so a malformed URL becomes an error reply rather than a crash.
    const url = new URL(req.url ?? '/', baseUrl);
    if (url.pathname.startsWith('/v1/')) return handleApi(req, res, url);
    if (url.pathname.startsWith('/pay/')) return handlePay(req, res, decodeURIComponent(url.pathname.slice('/pay/'.length)));
    if (url.pathname.startsWith('/_fake/')) return handleFake(req, res, url);
    fakeNotFound(res, `Unrecognized request URL (${req.method ?? 'GET'}: ${url.pathname}).`);
  }

  let baseUrl = '';
  const server = http.createServer((req, res) => {
    route(req, res).catch((error: Error) => {
      if (error instanceof ApiError) {
        sendApiError(res, error);
        return;
      }
      log(`${req.method} ${req.url} failed: ${error.stack ?? error.message}`);
      if (res.headersSent) res.destroy();
      else if (error instanceof URIError || error instanceof TypeError) sendJson(res, { status: 400, body: { error: { type: 'invalid_request_error', message: error.message } } });
      else sendJson(res, { status: 500, body: { error: { type: 'api_error', message: error.message } } });
    });
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 12111, host, () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  baseUrl = `http://${host}:${port}`;
  log(`listening on ${baseUrl} (checkout pages at ${baseUrl}/pay/<session>), webhooks to ${webhookUrl ?? 'nowhere (disabled)'}`);

  return {
    port,
    baseUrl,
    events: () => clone([...events.values()].reverse()),
    async close() {
      closed = true;
      for (const timer of retryTimers) clearTimeout(timer);
      retryTimers.clear();
      inflight.abort();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await writeChain;
    },
  };
}
