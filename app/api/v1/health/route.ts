// Liveness for the demo script, the tests and load balancers. Says nothing about the data.
export const runtime = 'nodejs';
export const dynamic = 'force-dynamic';

export function GET() {
  return Response.json({ ok: true });
}
