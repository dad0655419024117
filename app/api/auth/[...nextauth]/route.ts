// next-auth's own endpoints (sign-in, callback, session, sign-out); settings in lib/auth/options.ts.
import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';

export const runtime = 'nodejs';

async function handler(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  return NextAuth(authOptions())(req, ctx);
}

export { handler as GET, handler as POST };
