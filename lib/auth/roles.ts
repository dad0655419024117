// The four roles and where each one lands after sign-in. Pure: used by server and client code.
export const ROLES = ['engineer', 'office', 'landlord', 'homeowner'] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES: readonly Role[] = ['engineer', 'office'];
export const CUSTOMER_ROLES: readonly Role[] = ['landlord', 'homeowner'];

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export function homeFor(role: Role): string {
  switch (role) {
    case 'engineer':
      return '/field';
    case 'office':
      return '/office';
    case 'landlord':
    case 'homeowner':
      return '/portal';
  }
}

export const ROLE_LABELS: Record<Role, string> = {
  engineer: 'Engineer',
  office: 'Office',
  landlord: 'Landlord',
  homeowner: 'Homeowner',
};
