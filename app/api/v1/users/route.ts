import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { inviteSchema, userListQuerySchema } from '@/lib/validations/users';
import { inviteStaff, listUsers } from '@/db/staff';
import { actorFrom } from '@/db/audit';
import { sendMail } from '@/lib/mail/transport';
import { env } from '@/lib/env';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => listUsers(user.organisationId, parseQuery(req, userListQuerySchema)));

export const POST = apiRoute(['office'], async ({ req, user }) => {
  const input = await parseJson(req, inviteSchema);
  const { user: invited, token } = await inviteStaff(actorFrom(user), input);
  const link = `${env().NEXTAUTH_URL}/set-password?token=${token}`;
  await sendMail({
    to: invited.email,
    subject: 'Your Hearthmark account: set your password',
    text: [`Hello ${invited.name},`, '', `${user.name} has added you to Hearthmark as ${invited.role === 'office' ? 'office staff' : 'an engineer'}.`, 'Choose your password here (the link works once, for 7 days):', link, '', 'If you were not expecting this, ignore this e-mail.'].join('\n'),
  });
  return NextResponse.json({ user: invited }, { status: 201 });
});
