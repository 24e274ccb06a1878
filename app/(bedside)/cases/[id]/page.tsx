import { notFound } from 'next/navigation';
import { requireAccess } from '@/lib/server/access';
import { caseFacts } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { formatClock, formatDate, ageInYears } from '@/lib/_shared/time';
import { ASA_MEANING, DEPTH_LABEL, PROCEDURE_LABEL, STATUS_LABEL, bmi } from '@/lib/domain/caseFacts';
import { INTERVENTION_LABEL, type InterventionKind } from '@/lib/domain/intervention';
import { TopBar } from '../../../top-bar';

export const dynamic = 'force-dynamic';

export default async function CasePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireAccess('/cases/[id]');
  const { id } = await params;
  const c = await caseFacts(db(), id);
  if (!c) notFound();
  const tz = c.unit.timeZone;
  const t = now();
  const asa = c.asaClass ? `${c.asaClass}${c.asaEmergency ? 'E' : ''}` : 'not recorded';
  const fact = (label: string, value: React.ReactNode) => (
    <div>
      <span>{label}</span>
      {value}
    </div>
  );
  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>
          {c.patient.familyName.toUpperCase()}, {c.patient.givenName} <span className="muted">{c.patient.mrn}</span>{' '}
          <span className={`status status-${c.status}`}>{STATUS_LABEL[c.status] ?? c.status}</span>
        </h1>
        <section className="panel">
          <h2>Case facts</h2>
          <div className="facts" data-testid="facts">
            {fact('Age · sex', `${ageInYears(c.patient.birthDate, t) ?? '?'} y · ${c.patient.sex}`)}
            {fact('Procedure', PROCEDURE_LABEL[c.procedureType] ?? c.procedureType)}
            {fact('Room', c.room?.name ?? 'not set')}
            {fact('Date', formatDate(c.startAt, tz))}
            {fact('Proceduralist', c.proceduralist?.name ?? 'not set')}
            {fact('Sedation nurse', c.nurse?.displayName ?? 'not set')}
            {fact('Planned depth', DEPTH_LABEL[c.plannedDepth] ?? c.plannedDepth)}
            {fact('ASA physical status', <span title={c.asaClass ? ASA_MEANING[c.asaClass as keyof typeof ASA_MEANING] : undefined}>{asa}</span>)}
            {fact('Weight · height', c.weightKg && c.heightCm ? `${c.weightKg} kg · ${c.heightCm} cm` : 'not recorded')}
            {fact('BMI', bmi(c.weightKg, c.heightCm) ?? 'not recorded')}
            {fact('Airway (Mallampati)', c.airwayClass ?? 'not recorded')}
            {fact('Allergies', c.allergies || 'none recorded')}
            {fact('Monitor samples', c._count.samples.toLocaleString('en-GB'))}
          </div>
        </section>
        <section className="panel" style={{ marginTop: 12 }}>
          <h2>Timeline</h2>
          <table>
            <thead>
              <tr><th>Time</th><th>Entry</th></tr>
            </thead>
            <tbody>
              {[
                ...c.events.map((e) => ({ at: e.at, text: e.kind.replace(/_/g, ' '), voided: !!e.voidedAt, key: e.id })),
                ...c.doses.map((d) => ({ at: d.at, text: `${d.drug} ${d.amount} ${d.unit} ${d.route}`, voided: !!d.voidedAt, key: d.id })),
                ...c.interventions.map((i) => ({ at: i.at, text: INTERVENTION_LABEL[i.kind as InterventionKind] ?? i.kind, voided: !!i.voidedAt, key: i.id })),
              ]
                .sort((a, b) => a.at.getTime() - b.at.getTime())
                .map((r) => (
                  <tr key={r.key} className={r.voided ? 'voided' : undefined}>
                    <td>{formatClock(r.at, tz, true)}</td>
                    <td>{r.text}{r.voided ? ' (voided)' : ''}</td>
                  </tr>
                ))}
            </tbody>
          </table>
          {c.events.length + c.doses.length + c.interventions.length === 0 && <p className="muted">Nothing recorded yet.</p>}
        </section>
      </main>
    </>
  );
}
