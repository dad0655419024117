// Sign-in forms: one schema each, used by the form resolver and by the server.
import { z } from 'zod';

export const passwordSignInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(200),
});
export type PasswordSignIn = z.infer<typeof passwordSignInSchema>;

export const linkSignInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254),
});
export type LinkSignIn = z.infer<typeof linkSignInSchema>;
