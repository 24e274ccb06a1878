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
  '/cases/[id]/note': ['nurse', 'lead', 'admin'],
  '/cases/[id]/waveform': ['nurse', 'lead', 'admin'],
  '/reports': ['safety', 'lead', 'admin'],
  '/admin': ['admin'],
  // API: reading
  'GET /api/v1/cases': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]/sheet': ['nurse', 'lead', 'admin'],
  'GET /api/v1/patients': ['nurse', 'lead'],
  'GET /api/v1/cases/[id]/note': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]/note/pdf': ['nurse', 'lead', 'admin'],
  'GET /api/v1/cases/[id]/fhir': ['lead', 'admin'],
  'GET /api/v1/cases/[id]/waveform': ['nurse', 'lead', 'admin'],
  'GET /api/v1/me': ['nurse', 'lead', 'safety', 'admin'],
  // API: writing case data
  'POST /api/v1/cases': ['nurse', 'lead'],
  'PATCH /api/v1/cases/[id]': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/doses': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/imports': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/imports/preview': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/entries': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/note/sign': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/note/amend': ['nurse', 'lead'],
  'POST /api/v1/cases/[id]/note/cosign': ['lead'],
  'POST /api/v1/cases/[id]/waveform': ['nurse', 'lead'],
  // review (monthly review for the lead) — entries added by the review work go here
  '/review': ['lead'],
  '/review/cases': ['lead'],
  '/review/cases/[id]': ['lead'],
  '/review/queue': ['lead'],
  '/review/rule-sets': ['lead'],
  'GET /api/v1/review': ['lead'],
  'GET /api/v1/review/export': ['lead'],
  'GET /api/v1/review/cases': ['lead'],
  'GET /api/v1/review/cases/[id]': ['lead'],
  'PUT /api/v1/review/cases/[id]': ['lead'],
  'GET /api/v1/review/queue': ['lead'],
  'GET /api/v1/review/compare': ['lead'],
  'GET /api/v1/rule-sets': ['lead'],
  'POST /api/v1/rule-sets': ['lead'],
  'POST /api/v1/rule-sets/summaries': ['lead'],
  // reports (safety indicators) — entries added by the indicator work go here
  '/reports/issued/[id]': ['safety', 'lead', 'admin'],
  'GET /api/v1/indicators': ['safety', 'lead'],
  'GET /api/v1/reports': ['safety', 'lead', 'admin'],
  'POST /api/v1/reports': ['safety'],
  'GET /api/v1/reports/export': ['safety', 'lead'],
  'GET /api/v1/reports/[id]': ['safety', 'lead', 'admin'],
  'GET /api/v1/reports/[id]/export': ['safety', 'lead'],
  'GET /api/v1/reports/[id]/refs/[ref]': ['lead'],
  // API: administration
  'GET /api/v1/admin/users': ['admin'],
  'POST /api/v1/admin/users': ['admin'],
  '/audit': ['lead', 'admin'],
  'GET /api/v1/audit': ['lead', 'admin'],
  'POST /api/v1/admin/rule-set': ['admin', 'lead'],
  'GET /api/v1/hl7-inbox': ['nurse', 'lead'],
  'POST /api/v1/hl7-inbox/attach': ['nurse', 'lead'],
  'GET /api/v1/cases/[id]/live': ['nurse', 'lead', 'admin'],
} as const satisfies Record<string, readonly Role[]>;

/** Routes reachable without a session. */
export const PUBLIC_ROUTES = ['/sign-in', 'POST /sign-out', 'GET /api/health', 'POST /api/v1/session', 'DELETE /api/v1/session', 'POST /api/v1/hl7'] as const;

export type AccessKey = keyof typeof ACCESS;

export function allows(key: AccessKey, role: Role): boolean {
  return (ACCESS[key] as readonly Role[]).includes(role);
}
