// Landlords and homeowners (customer accounts): list query and form schema, shared by the office
// screens and /api/v1/customers.
import { z } from 'zod';
import { listQuerySchema, optionalText, requiredText } from './list-query';

export const CUSTOMER_ROLES = ['landlord', 'homeowner'] as const;
export const CUSTOMER_SORTS = ['name', 'email', 'role', 'sites', 'updated'] as const;

export const customerListQuerySchema = listQuerySchema(CUSTOMER_SORTS, {
  role: z.enum(CUSTOMER_ROLES, { message: 'role must be landlord or homeowner' }).optional(),
});
export type CustomerListQuery = z.infer<typeof customerListQuerySchema>;

export const customerSchema = z.object({
  role: z.enum(CUSTOMER_ROLES, { message: 'Choose landlord or homeowner' }),
  name: requiredText(200, 'Name'),
  email: z.string({ message: 'E-mail is required' }).trim().toLowerCase().email('Enter an e-mail address like name@example.com').max(254),
  phone: optionalText(40, 'Phone'),
});
export type CustomerInput = z.input<typeof customerSchema>;
export type CustomerData = z.output<typeof customerSchema>;
