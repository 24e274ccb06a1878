'use client';
import { useMemo, useState } from 'react';
import { useRouter } from 'next/navigation';
import type { CaseNote } from '@/lib/note/types';
import { diffNotes } from '@/lib/note/diffNotes';
import { TrendChart, type ChartSeries } from '../trend-chart';

interface Version {
  id: string;
  version: number;
  kind: 'signed' | 'amended';
  reason: string | null;
  note: CaseNote;
  author: string;
  authorRole: string;
  createdAt: string;
  cosignRequired: boolean;
  cosignedBy: string | null;
  cosignedAt: string | null;
}

/** Review the draft beside the chart, add free text, sign with the password; amend with a reason; compare versions. */
export function NoteView(props: {
  caseId: string;
  status: string;
  draft: CaseNote;
  versions: Version[];
  sheet: { samples: Record<string, ChartSeries>; episodes: { rule: string; start: number; end: number }[]; startMs: number; timeZone: string; etco2Unit: 'mmHg' | 'kPa'; doses: { at: string; label: string }[] };
  can: { sign: boolean; amend: boolean; cosign: boolean; fhir: boolean };
}) {
  const router = useRouter();
  const latest = props.versions[props.versions.length - 1];
  const signed = !!latest;
  const [freeText, setFreeText] = useState(latest?.note.freeText ?? props.draft.freeText ?? '');
  const [password, setPassword] = useState('');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [a, setA] = useState(Math.max(1, (latest?.version ?? 1) - 1));
  const [b, setB] = useState(latest?.version ?? 1);
  const shown = latest?.note ?? props.draft;

  const act = async (action: 'sign' | 'amend' | 'cosign') => {
    setError(null);
    if (!password) return setError('Enter your password to sign.');
    setBusy(true);
    const body = action === 'cosign' ? { password } : action === 'sign' ? { password, freeText: freeText || null } : { password, freeText: freeText || null, reason };
    const r = await fetch(`/api/v1/cases/${encodeURIComponent(props.caseId)}/note/${action}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
    setBusy(false);
    if (!r.ok) return setError(((await r.json().catch(() => ({}))) as { error?: string }).error ?? `not saved (${r.status})`);
    setPassword('');
    setReason('');
    router.refresh();
  };

  const diff = useMemo(() => {
    const va = props.versions.find((v) => v.version === a);
    const vb = props.versions.find((v) => v.version === b);
    return va && vb && va !== vb ? diffNotes(va.note, vb.note) : null;
  }, [a, b, props.versions]);

  const markers = props.sheet.doses.map((d) => ({ t: (Date.parse(d.at) - props.sheet.startMs) / 1000, label: d.label, kind: 'dose' as const }));
  const pdf = (v: number | null, size: 'A4' | 'LETTER') => `/api/v1/cases/${encodeURIComponent(props.caseId)}/note/pdf?size=${size}${v ? `&version=${v}` : ''}`;

  return (
    <div className="note-grid">
      <section className="panel note-text">
        <h1>
          Case note {signed ? `· version ${latest.version} (${latest.kind === 'signed' ? 'signed' : 'amended'})` : '· draft'}
        </h1>
        {latest?.cosignRequired && (
          <p className={latest.cosignedAt ? 'ok' : 'warn-line'} data-testid="cosign-state">
            {latest.cosignedAt ? `Co-signed by ${latest.cosignedBy} on ${new Date(latest.cosignedAt).toLocaleString('en-GB', { timeZone: props.sheet.timeZone })}.` : 'Needs the lead’s co-signature (level “breathing supported” or above, or major physiology).'}
          </p>
        )}
        <pre className="note-pre" data-testid="note-text">{shown.text}</pre>
        <div className="row">
          <a className="button" href={pdf(signed ? latest.version : null, 'A4')} target="_blank" rel="noreferrer" data-testid="pdf-a4">PDF (A4)</a>
          <a className="button" href={pdf(signed ? latest.version : null, 'LETTER')} target="_blank" rel="noreferrer">PDF (Letter)</a>
          {props.can.fhir && <a className="button" href={`/api/v1/cases/${encodeURIComponent(props.caseId)}/fhir${signed ? `?version=${latest.version}` : ''}`} data-testid="fhir-link">FHIR R4 bundle</a>}
        </div>
      </section>
      <div className="note-side">
        <section className="panel">
          <TrendChart series={props.sheet.samples} episodes={props.sheet.episodes} markers={markers} startMs={props.sheet.startMs} timeZone={props.sheet.timeZone} etco2Unit={props.sheet.etco2Unit} height={240} />
        </section>
        <section className="panel">
          <h2>{signed ? 'Amend the note' : 'Sign the note'}</h2>
          <label htmlFor="note-free">Nurse&apos;s notes (added to the note)</label>
          <textarea id="note-free" rows={4} value={freeText} onChange={(e) => setFreeText(e.target.value)} maxLength={4000} />
          {signed && (
            <>
              <label htmlFor="note-reason">Reason for the amendment</label>
              <input id="note-reason" value={reason} onChange={(e) => setReason(e.target.value)} placeholder="e.g. intervention time corrected after review" />
            </>
          )}
          <label htmlFor="note-password">Your password (signing is you, not the open session)</label>
          <input id="note-password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} />
          {error && <p className="error" role="alert" data-testid="note-error">{error}</p>}
          <div className="row">
            {!signed && props.can.sign && <button className="primary big" type="button" disabled={busy} onClick={() => act('sign')} data-testid="sign-note">Sign note</button>}
            {signed && props.can.amend && <button className="primary big" type="button" disabled={busy} onClick={() => act('amend')} data-testid="amend-note">Save amendment (version {latest.version + 1})</button>}
            {signed && props.can.cosign && latest.cosignRequired && !latest.cosignedAt && (
              <button className="big" type="button" disabled={busy} onClick={() => act('cosign')} data-testid="cosign-note">Co-sign version {latest.version}</button>
            )}
          </div>
          {!signed && <p className="small muted">Signing freezes the note, its analysis and the rule-set version ({props.draft.ruleSet.id} v{props.draft.ruleSet.version}). Later changes are amendments with a reason.</p>}
        </section>
        {props.versions.length > 0 && (
          <section className="panel" data-testid="note-history">
            <h2>History</h2>
            <ul className="plain">
              {props.versions.map((v) => (
                <li key={v.id}>
                  <strong>v{v.version}</strong> {v.kind} by {v.author} ({v.authorRole}) on {new Date(v.createdAt).toLocaleString('en-GB', { timeZone: props.sheet.timeZone })}
                  {v.reason ? ` — ${v.reason}` : ''} · <a href={pdf(v.version, 'A4')} target="_blank" rel="noreferrer">PDF</a>
                </li>
              ))}
            </ul>
            {props.versions.length > 1 && (
              <>
                <div className="row">
                  <label htmlFor="diff-a">Compare</label>
                  <select id="diff-a" value={a} onChange={(e) => setA(Number(e.target.value))}>{props.versions.map((v) => <option key={v.version} value={v.version}>v{v.version}</option>)}</select>
                  <label htmlFor="diff-b">with</label>
                  <select id="diff-b" value={b} onChange={(e) => setB(Number(e.target.value))}>{props.versions.map((v) => <option key={v.version} value={v.version}>v{v.version}</option>)}</select>
                </div>
                {diff && (
                  <pre className="note-pre diff" data-testid="note-diff">
                    {diff.lines.filter((l) => l.op !== 'unchanged').map((l, i) => (
                      <span key={i} className={l.op === 'added' ? 'diff-add' : 'diff-del'}>{`${l.op === 'added' ? '+ ' : '− '}${l.text}\n`}</span>
                    ))}
                    {diff.added + diff.removed === 0 && 'No difference in the text.'}
                  </pre>
                )}
              </>
            )}
          </section>
        )}
      </div>
    </div>
  );
}
