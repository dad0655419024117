import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { customerListQuerySchema, customerSchema } from '@/lib/validations/customers';
import { createCustomer, listCustomers } from '@/db/customers';
import { actorFrom } from '@/db/audit';
import { NextResponse } from 'next/server';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => listCustomers(user.organisationId, parseQuery(req, customerListQuerySchema)));

export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, customerSchema);
  return NextResponse.json({ customer: await createCustomer(actorFrom(user), data) }, { status: 201 });
});
