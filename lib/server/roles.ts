/** Roles of Plateau's users. */
export const ROLES = ['nurse', 'lead', 'safety', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABEL: Record<Role, string> = {
  nurse: 'Sedation nurse',
  lead: 'Anaesthesia / sedation lead',
  safety: 'Safety officer (reports, read-only)',
  admin: 'Administrator',
};

/** Where each role lands after sign-in. */
export const HOME_FOR_ROLE: Record<Role, string> = {
  nurse: '/cases',
  lead: '/cases',
  safety: '/reports',
  admin: '/admin',
};

export function isRole(x: unknown): x is Role {
  return typeof x === 'string' && (ROLES as readonly string[]).includes(x);
}
