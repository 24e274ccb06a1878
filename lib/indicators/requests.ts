/**
 * zod schemas of the indicator requests (report pages, issue, exports, the JSON API). Query
 * strings arrive as strings: `scope` is `all` or unit ids separated by commas (or repeated),
 * `minCell` a whole number.
 */
import { z } from 'zod';
import { PERIOD_KINDS, parsePeriod } from './period';

const periodLabel = z.string().refine((s) => parsePeriod(s) !== null, { message: 'must be a month (YYYY-MM), a quarter (YYYY-Qn) or a year (YYYY)' });

const isoDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date YYYY-MM-DD' })
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().slice(0, 10) === s, { message: 'is not a calendar date' });

/** `all`, one id, `a,b`, or the values of a repeated parameter. */
export const ScopeParam = z
  .union([z.string(), z.array(z.string())])
  .optional()
  .transform((v): 'all' | string[] => {
    const ids = (Array.isArray(v) ? v : v === undefined ? [] : [v]).flatMap((s) => s.split(',')).map((s) => s.trim()).filter(Boolean);
    return ids.length === 0 || ids.includes('all') ? 'all' : ids;
  });

const minCellParam = z.coerce.number({ message: 'must be a whole number' }).int({ message: 'must be a whole number' }).min(1, { message: 'must be at least 1' }).max(1000, { message: 'must be at most 1000' }).optional();

/** Body of POST /api/v1/reports (issue). */
export const IssueReportInput = z.object({
  period: periodLabel,
  scope: z.union([z.literal('all'), z.array(z.string().min(1)).min(1, { message: 'choose at least one unit' })]).default('all'),
  minCell: z.number().int({ message: 'must be a whole number' }).min(1).max(1000).optional(),
});
export type IssueReportInput = z.infer<typeof IssueReportInput>;

export const ExportFormatParam = z.enum(['pdf', 'csv', 'json'], { message: 'must be pdf, csv or json' });

/** Query of GET /api/v1/reports/export (a draft report as a file) and of the /reports page. */
export const DraftExportQuery = z.object({ period: periodLabel, scope: ScopeParam, minCell: minCellParam, format: ExportFormatParam });

/** Query of GET /api/v1/indicators. */
export const SeriesQuery = z.object({
  from: isoDate,
  to: isoDate,
  period: z.enum(PERIOD_KINDS, { message: 'must be month, quarter or year' }).default('month'),
  scope: ScopeParam,
  minCell: minCellParam,
});

/** Query parameters as an object, keeping repeated keys as arrays. */
export function queryObject(params: URLSearchParams): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    out[key] = all.length > 1 ? all : all[0];
  }
  return out;
}
