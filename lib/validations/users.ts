// Staff management: invitations, role changes, deactivation, setting a password from an invite;
// plus the audit log search query.
import { z } from 'zod';
import { listQuerySchema } from './list-query';

export const STAFF_ROLES = ['engineer', 'office'] as const;
export const USER_SORTS = ['name', 'email', 'role', 'active'] as const;
export const userListQuerySchema = listQuerySchema(USER_SORTS, {
  role: z.enum(['engineer', 'office', 'landlord', 'homeowner'], { message: 'role is not known' }).optional(),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

export const inviteSchema = z.object({
  name: z.string({ message: 'Name is required' }).trim().min(1, 'Name is required').max(200),
  email: z.string({ message: 'E-mail is required' }).trim().toLowerCase().email('Enter an e-mail address like name@example.com').max(254),
  role: z.enum(STAFF_ROLES, { message: 'Choose engineer or office' }),
});
export type InviteInput = z.input<typeof inviteSchema>;

export const userUpdateSchema = z
  .object({
    role: z.enum(STAFF_ROLES, { message: 'Choose engineer or office' }).optional(),
    active: z.boolean().optional(),
  })
  .strict()
  .refine((u) => u.role !== undefined || u.active !== undefined, { message: 'Nothing to change', path: ['_'] });

export const setPasswordSchema = z
  .object({
    token: z.string().min(20).max(200),
    password: z.string({ message: 'Choose a password' }).min(12, 'Use at least 12 characters').max(200),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { message: 'The two passwords differ', path: ['confirm'] });

export const AUDIT_SORTS = ['at'] as const;
export const auditQuerySchema = listQuerySchema(AUDIT_SORTS, {
  entity: z.enum(['customer', 'site', 'appliance', 'visit', 'analyser', 'user', 'calendar_feed', 'settings'], { message: 'entity is not known' }).optional(),
  actorId: z.string().uuid('actorId must be an id').optional(),
  entityId: z.string().uuid('entityId must be an id').optional(),
  from: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'from must be a date').optional(),
  to: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'to must be a date').optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;
