import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { unitForUser } from '@/lib/server/unit';
import { casesForDay } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { formatClock, formatDate, localDate, ageInYears } from '@/lib/_shared/time';
import { TopBar } from '../../top-bar';
import { STATUS_LABEL, PROCEDURE_LABEL, DEPTH_LABEL } from '@/lib/domain/caseFacts';

export const dynamic = 'force-dynamic';

export default async function CasesToday() {
  const user = await requireAccess('/cases');
  const unit = await unitForUser(user);
  const t = now();
  if (!unit) {
    return (
      <>
        <TopBar user={user} />
        <main><h1>No unit yet</h1><p className="muted">An administrator must set up a unit and its rooms first.</p></main>
      </>
    );
  }
  const date = localDate(t, unit.timeZone);
  const cases = await casesForDay(db(), unit.id, date);
  const rooms = [...unit.rooms.map((r) => ({ id: r.id as string | null, name: r.name })), { id: null, name: 'No room yet' }];
  return (
    <>
      <TopBar user={user} />
      <main>
        <div className="row" style={{ justifyContent: 'space-between' }}>
          <h1>
            Cases today · {unit.name} <span className="muted">{formatDate(t, unit.timeZone)}</span>
          </h1>
          {(user.role === 'nurse' || user.role === 'lead') && (
            <Link href="/cases/new" className="button primary" data-testid="new-case">
              Open a case
            </Link>
          )}
        </div>
        <div className="grid-rooms">
          {rooms.map((room) => {
            const list = cases.filter((c) => c.roomId === room.id);
            if (room.id === null && list.length === 0) return null;
            return (
              <section key={room.id ?? 'none'} className="panel" aria-label={room.name} data-testid="room">
                <h2>{room.name}</h2>
                {list.length === 0 && <p className="muted">No cases booked.</p>}
                {list.map((c) => (
                  <Link key={c.id} href={`/cases/${c.id}`} className="case-row" data-testid="case-row">
                    <span>
                      <strong>{formatClock(c.startAt, unit.timeZone)}</strong> {c.patient.familyName.toUpperCase()}, {c.patient.givenName}{' '}
                      <span className="muted">
                        {c.patient.mrn} · {ageInYears(c.patient.birthDate, t) ?? '?'} y · {c.patient.sex}
                      </span>
                    </span>
                    <span className="muted">
                      {PROCEDURE_LABEL[c.procedureType] ?? c.procedureType} · {DEPTH_LABEL[c.plannedDepth] ?? c.plannedDepth} · {c.proceduralist?.name ?? 'proceduralist not set'}
                    </span>
                    <span>
                      <span className={`status status-${c.status}`}>{STATUS_LABEL[c.status] ?? c.status}</span>
                      {c.nurse && <span className="muted"> · {c.nurse.displayName}</span>}
                    </span>
                  </Link>
                ))}
              </section>
            );
          })}
        </div>
      </main>
    </>
  );
}
