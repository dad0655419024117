import 'server-only';
// Wraps every /api/v1 route handler: who is asking first, then the handler; every failure leaves
// as { error: { code, message, fields? } } with its status. Unknown errors are logged, never shown.
import { NextResponse } from 'next/server';
import { ZodError, type ZodType } from 'zod';
import { AppError, errorBody, fieldsFromIssues } from '@/lib/errors';
import { requireRole, type SessionUser } from '@/lib/auth/session';
import type { Role } from '@/lib/auth/roles';
import { env } from '@/lib/env';

type Ctx<P> = { req: Request; user: SessionUser; params: P };
type Handler<P> = (ctx: Ctx<P>) => Promise<Response | unknown>;

export function toErrorResponse(err: unknown): NextResponse {
  if (err instanceof AppError) return NextResponse.json(errorBody(err), { status: err.status });
  if (err instanceof ZodError) {
    const e = new AppError('invalid_input', 'Some fields are not valid.', fieldsFromIssues(err.issues));
    return NextResponse.json(errorBody(e), { status: e.status });
  }
  if (err instanceof Error && err.name === 'CombustionInputError') {
    const field = (err as Error & { field?: string }).field ?? '_';
    const e = new AppError('invalid_input', err.message, { [field]: err.message });
    return NextResponse.json(errorBody(e), { status: e.status });
  }
  console.error('[api] unexpected error', err);
  return NextResponse.json(errorBody(new AppError('internal', 'Something went wrong on our side. Nothing was changed.')), { status: 500 });
}

const UNSAFE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * Cross-site request refusal for cookie-authenticated writes. Browsers send Origin on every
 * cross-origin POST/PUT/PATCH/DELETE (and Sec-Fetch-Site); a write whose origin is not this app
 * is refused before anything runs. Non-browser clients (scripts, integrators) send neither.
 */
export function assertSameOrigin(req: Request): void {
  if (!UNSAFE_METHODS.has(req.method.toUpperCase())) return;
  const origin = req.headers.get('origin');
  const site = req.headers.get('sec-fetch-site');
  if (site === 'cross-site') throw new AppError('forbidden', 'Cross-site request refused.');
  if (!origin) return;
  const allowed = new Set([new URL(env().NEXTAUTH_URL).origin, new URL(req.url).origin]);
  const host = req.headers.get('host');
  if (host) {
    allowed.add(`http://${host}`);
    allowed.add(`https://${host}`);
  }
  if (!allowed.has(origin)) throw new AppError('forbidden', 'Cross-site request refused.');
}

export function apiRoute<P = Record<string, never>>(roles: readonly Role[], handler: Handler<P>) {
  return async (req: Request, context: { params: Promise<P> }): Promise<Response> => {
    try {
      assertSameOrigin(req);
      const user = await requireRole(roles);
      const params = (await context?.params) ?? ({} as P);
      const result = await handler({ req, user, params });
      if (result instanceof Response) return result;
      return NextResponse.json(result);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
}

/** Query strings are the caller's mistake when wrong: 400 naming the parameter. */
export function parseQuery<T>(req: Request, schema: ZodType<T>): T {
  const url = new URL(req.url);
  const raw: Record<string, string> = {};
  for (const [k, v] of url.searchParams) raw[k] = v;
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw new AppError('bad_request', 'The query has parameters that are not valid.', fieldsFromIssues(parsed.error.issues));
  return parsed.data;
}

const MAX_JSON_BYTES = 1_000_000;

/** JSON bodies: 413 when too large, 400 when not JSON, 422 naming each bad field. */
export async function parseJson<T>(req: Request, schema: ZodType<T>): Promise<T> {
  const length = Number(req.headers.get('content-length') ?? '0');
  if (length > MAX_JSON_BYTES) throw new AppError('payload_too_large', 'The request body is too large.');
  const text = await req.text();
  if (text.length > MAX_JSON_BYTES) throw new AppError('payload_too_large', 'The request body is too large.');
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw new AppError('bad_request', 'The request body is not valid JSON.');
  }
  // PostgreSQL refuses NUL in text columns (a 500 at insert time); refuse it here for both databases.
  if (containsNul(body)) throw new AppError('invalid_input', 'Text may not contain NUL characters.', { _: 'remove the NUL (\\u0000) characters' });
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new AppError('invalid_input', 'Some fields are not valid.', fieldsFromIssues(parsed.error.issues));
  return parsed.data;
}

/** Walks the parsed body without recursion (bodies may nest tens of thousands deep). */
function containsNul(value: unknown): boolean {
  const stack: unknown[] = [value];
  while (stack.length) {
    const v = stack.pop();
    if (typeof v === 'string') {
      if (v.includes('\u0000')) return true;
    } else if (v && typeof v === 'object') {
      for (const [k, child] of Object.entries(v)) {
        if (k.includes('\u0000')) return true;
        stack.push(child);
      }
    }
  }
  return false;
}
