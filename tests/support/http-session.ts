// Signs in against a running app the way a browser does (next-auth's credentials flow) and
// returns the session cookie, for tests and benchmarks that talk HTTP without a page.
export async function staffSessionCookie(input: { baseUrl: string; email: string; password: string }): Promise<string> {
  const csrfRes = await fetch(`${input.baseUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const csrfCookie = (csrfRes.headers.getSetCookie?.() ?? []).map((c) => c.split(';')[0]).join('; ');
  const res = await fetch(`${input.baseUrl}/api/auth/callback/password`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: csrfCookie },
    body: new URLSearchParams({ csrfToken, email: input.email, password: input.password, json: 'true' }),
  });
  const session = (res.headers.getSetCookie?.() ?? []).map((c) => c.split(';')[0]).find((c) => c.startsWith('next-auth.session-token=') || c.startsWith('__Secure-next-auth.session-token='));
  if (!session) throw new Error(`sign-in as ${input.email} failed (status ${res.status})`);
  return session;
}
