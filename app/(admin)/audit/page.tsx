import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { AuditQuery, searchAudit, type AuditPage } from '@/lib/db/auditSearch';
import { zodMessage } from '@/lib/_shared/zodMessage';
import { TopBar } from '../../top-bar';

export const dynamic = 'force-dynamic';

type Params = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) ?? '';

/** The audit trail, searchable by case, user and period (leads and admins). */
export default async function AuditPageView({ searchParams }: { searchParams: Promise<Params> }) {
  const user = await requireAccess('/audit');
  const sp = await searchParams;
  const raw = { caseId: one(sp.caseId), user: one(sp.user), action: one(sp.action), from: one(sp.from), to: one(sp.to), before: one(sp.before), limit: one(sp.limit) };
  const parsed = AuditQuery.safeParse(raw);
  let result: AuditPage | null = null;
  if (parsed.success) result = await searchAudit(db(), parsed.data);
  const more = result?.nextBefore ? `/audit?${new URLSearchParams({ ...Object.fromEntries(Object.entries(raw).filter(([, v]) => v)), before: String(result.nextBefore) })}` : null;
  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>Audit trail</h1>
        <p className="muted">Every create, void, re-time, sign, amend, review, export, sign-in and admin change, newest first. The chain is checked with <code>npm run audit:verify</code>.</p>
        <form method="get" action="/audit" className="panel row" data-testid="audit-search">
          <label>Case <input name="caseId" defaultValue={raw.caseId} placeholder="case id" /></label>
          <label>User <input name="user" defaultValue={raw.user} placeholder="username or name" /></label>
          <label>Action <input name="action" defaultValue={raw.action} placeholder="e.g. sign_in_failed" /></label>
          <label>From <input name="from" type="date" defaultValue={raw.from} /></label>
          <label>To <input name="to" type="date" defaultValue={raw.to} /></label>
          <button type="submit">Search</button>
        </form>
        {!parsed.success && <p className="error" role="alert">{zodMessage(parsed.error)}</p>}
        {result && (
          <section className="panel" style={{ marginTop: 12 }}>
            {result.rows.length === 0 ? (
              <p className="muted" data-testid="audit-empty">No entry matches.</p>
            ) : (
              <div className="table-scroll">
                <table data-testid="audit-rows">
                  <thead><tr><th>#</th><th>Time (UTC)</th><th>User</th><th>Role</th><th>Action</th><th>Entity</th><th>Case</th><th>Before</th><th>After</th><th>Origin</th></tr></thead>
                  <tbody>
                    {result.rows.map((r) => (
                      <tr key={r.seq}>
                        <td>{r.seq}</td>
                        <td>{r.at.slice(0, 19).replace('T', ' ')}</td>
                        <td>{r.actor ?? '—'}</td>
                        <td>{r.role ?? '—'}</td>
                        <td>{r.action}</td>
                        <td>{r.entity}{r.entityId ? ` ${r.entityId}` : ''}</td>
                        <td>{r.caseId ? <Link href={`/audit?caseId=${encodeURIComponent(r.caseId)}`}>{r.caseId}</Link> : '—'}</td>
                        <td className="small"><code>{r.before ?? ''}</code></td>
                        <td className="small"><code>{r.after ?? ''}</code></td>
                        <td>{r.origin ?? '—'}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
            {more && <p><Link href={more}>Older entries</Link></p>}
          </section>
        )}
      </main>
    </>
  );
}
