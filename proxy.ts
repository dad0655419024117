// Next.js proxy: passes the requested path to the area layouts so that a signed-out visitor
// returns to it after signing in. It is not a security boundary: layouts and handlers check roles.
import { NextResponse, type NextRequest } from 'next/server';

export function proxy(req: NextRequest) {
  const headers = new Headers(req.headers);
  headers.set('x-hm-path', req.nextUrl.pathname + req.nextUrl.search);
  return NextResponse.next({ request: { headers } });
}

export const config = { matcher: ['/field/:path*', '/office/:path*', '/portal/:path*', '/field', '/office', '/portal'] };
