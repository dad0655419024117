// Accepting an invitation: the invited person has no session yet, so the one-use token in the
// link is the credential here (no role check). Answers 404 for any unusable link.
import { NextResponse } from 'next/server';
import { parseJson, toErrorResponse } from '@/lib/api/handler';
import { setPasswordSchema } from '@/lib/validations/users';
import { acceptInvite } from '@/db/staff';
import { hashPassword } from '@/lib/auth/password';

export const runtime = 'nodejs';

export async function POST(req: Request): Promise<Response> {
  try {
    const input = await parseJson(req, setPasswordSchema);
    const { email } = await acceptInvite(input.token, await hashPassword(input.password));
    return NextResponse.json({ email });
  } catch (err) {
    return toErrorResponse(err);
  }
}
