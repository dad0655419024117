// Type augmentation: our session carries id, role, organisation and when the token was issued.
import type { Role } from '@/lib/auth/roles';

declare module 'next-auth' {
  interface Session {
    user?: { id: string; role: Role; organisationId: string; name: string; email: string; issuedAt: number };
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    uid?: string;
    role?: Role;
    organisationId?: string;
  }
}
