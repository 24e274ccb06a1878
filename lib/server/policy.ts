import type { Role } from './roles';

/**
 * Who may reach each page and API route. Every page.tsx and route.ts under app/ must appear
 * here (a test walks app/ and checks), and each calls requireAccess/authorizeApi with its own
 * pattern, so the table is the single answer to "who can do what".
 */
export const ACCESS = {
  // pages
  '/': ['nurse', 'lead', 'safety', 'admin'],
  '/cases': ['nurse', 'lead', 'admin'],
  '/cases/new': ['nurse', 'lead'],
  '/cases/[id]': ['nurse', 'lead', 'admin'],
  '/reports': ['safety', 'lead', 'admin'],
  '/admin': ['admin'],
  // API: reading
  'GET /api/v1/cases': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]/sheet': ['nurse', 'lead', 'admin'],
  'GET /api/v1/patients': ['nurse', 'lead'],
  'GET /api/v1/me': ['nurse', 'lead', 'safety', 'admin'],
  // API: writing case data
  'POST /api/v1/cases': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/doses': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/imports': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/imports/preview': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/entries': ['nurse', 'lead'],
  // review (monthly review for the lead) — entries added by the review work go here
  // reports (safety indicators) — entries added by the indicator work go here
  // API: administration
  'GET /api/v1/admin/users': ['admin'],
  'POST /api/v1/admin/users': ['admin'],
} as const satisfies Record<string, readonly Role[]>;

/** Routes reachable without a session. */
export const PUBLIC_ROUTES = ['/sign-in', 'POST /sign-out', 'GET /api/health', 'POST /api/v1/session', 'DELETE /api/v1/session'] as const;

export type AccessKey = keyof typeof ACCESS;

export function allows(key: AccessKey, role: Role): boolean {
  return (ACCESS[key] as readonly Role[]).includes(role);
}
