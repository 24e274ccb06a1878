import { requireAccess } from '@/lib/server/access';
import { unitForUser } from '@/lib/server/unit';
import { casesPerMonth } from '@/lib/db/reports';
import { db } from '@/lib/db/client';
import { TopBar } from '../../top-bar';

export const dynamic = 'force-dynamic';

export default async function ReportsPage() {
  const user = await requireAccess('/reports');
  const unit = await unitForUser(user);
  const months = unit ? await casesPerMonth(db(), unit.id) : [];
  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>Reports{unit ? ` · ${unit.name}` : ''}</h1>
        <section className="panel">
          <h2>Completed sedation cases per month</h2>
          <table data-testid="months">
            <thead><tr><th>Month</th><th>Cases</th></tr></thead>
            <tbody>
              {months.map((m) => (
                <tr key={m.month}><td>{m.month}</td><td>{m.cases}</td></tr>
              ))}
            </tbody>
          </table>
          {months.length === 0 && <p className="muted">No completed cases yet.</p>}
        </section>
      </main>
    </>
  );
}
