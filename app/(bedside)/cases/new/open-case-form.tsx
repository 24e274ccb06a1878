'use client';
import { useEffect, useMemo, useState } from 'react';
import { useRouter } from 'next/navigation';
import { ASA_CLASSES, ASA_MEANING, DEPTHS, DEPTH_LABEL, DEPTH_MEANING, bmi } from '@/lib/domain/caseFacts';
import { STOP_BANG_BAND_LABEL, STOP_BANG_SPECS, STOP_ITEMS, stopBangFromFacts } from '@/lib/domain/stopBang';

interface Options {
  rooms: { id: string; name: string }[];
  proceduralists: { id: string; name: string; specialty: string | null }[];
  procedures: { code: string; label: string }[];
  defaults: { roomId: string | null; proceduralistId: string | null };
}
interface Patient {
  id: string;
  mrn: string;
  familyName: string;
  givenName: string;
  birthDate: string;
  sex: string;
}

function ageOf(birthDate: string): number | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(birthDate);
  if (!m) return null;
  const now = new Date();
  let a = now.getFullYear() - Number(m[1]);
  if (now.getMonth() + 1 < Number(m[2]) || (now.getMonth() + 1 === Number(m[2]) && now.getDate() < Number(m[3]))) a--;
  return a;
}

const numOrNull = (s: string) => (s.trim() === '' ? null : Number(s));

/** Opening a case in under 30 seconds: find or add the patient, then the facts, with the unit's defaults. */
export function OpenCaseForm({ options }: { options: Options }) {
  const router = useRouter();
  const [q, setQ] = useState('');
  const [found, setFound] = useState<Patient[]>([]);
  const [patient, setPatient] = useState<Patient | null>(null);
  const [adding, setAdding] = useState(false);
  const [np, setNp] = useState({ mrn: '', familyName: '', givenName: '', birthDate: '', sex: '' });
  const [procedureType, setProcedure] = useState(options.procedures[0]?.code ?? '');
  const [roomId, setRoom] = useState(options.defaults.roomId ?? '');
  const [proceduralistId, setProceduralist] = useState(options.defaults.proceduralistId ?? '');
  const [depth, setDepth] = useState<string>('moderate');
  const [asa, setAsa] = useState<string>('');
  const [asaE, setAsaE] = useState(false);
  const [weight, setWeight] = useState('');
  const [height, setHeight] = useState('');
  const [neck, setNeck] = useState('');
  const [stop, setStop] = useState<Record<string, boolean | null>>({ snoring: null, tired: null, observedApnea: null, pressure: null });
  const [airway, setAirway] = useState('');
  const [solidsH, setSolidsH] = useState('');
  const [clearsH, setClearsH] = useState('');
  const [allergies, setAllergies] = useState('');
  const [spo2, setSpo2] = useState('');
  const [oxygen, setOxygen] = useState('nasal cannula 2 L/min');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    if (q.trim().length < 2) {
      setFound([]);
      return;
    }
    const ctl = new AbortController();
    const t = setTimeout(async () => {
      try {
        const r = await fetch(`/api/v1/patients?q=${encodeURIComponent(q.trim())}`, { signal: ctl.signal });
        if (r.ok) setFound(((await r.json()) as { patients: Patient[] }).patients);
      } catch {
        /* aborted */
      }
    }, 200);
    return () => {
      clearTimeout(t);
      ctl.abort();
    };
  }, [q]);

  const who = patient ?? (adding ? { birthDate: np.birthDate, sex: np.sex } : null);
  const b = bmi(numOrNull(weight), numOrNull(height));
  const sb = useMemo(() => {
    if (STOP_ITEMS.some((k) => stop[k] === null)) return null;
    return stopBangFromFacts({
      answers: { snoring: !!stop.snoring, tired: !!stop.tired, observedApnea: !!stop.observedApnea, pressure: !!stop.pressure },
      bmi: b,
      age: who?.birthDate ? ageOf(who.birthDate) : null,
      sex: (who?.sex as 'female' | 'male' | 'other' | 'unknown') || null,
      neckCm: numOrNull(neck),
    });
  }, [stop, b, who?.birthDate, who?.sex, neck]);

  const submit = async (ev: React.FormEvent) => {
    ev.preventDefault();
    setError(null);
    if (!patient && !adding) return setError('Find the patient, or add a new one.');
    const hoursAgo = (h: string) => (h.trim() === '' ? null : new Date(Date.now() - Number(h) * 3600_000).toISOString());
    const body = {
      ...(patient ? { patientId: patient.id } : { patient: np }),
      procedureType,
      roomId,
      proceduralistId: proceduralistId || null,
      plannedDepth: depth,
      asaClass: asa || null,
      asaEmergency: asaE,
      weightKg: numOrNull(weight),
      heightCm: numOrNull(height),
      neckCm: numOrNull(neck),
      stopBang: { snoring: stop.snoring, tired: stop.tired, observed: stop.observedApnea, pressure: stop.pressure, neck: neck.trim() === '' ? null : Number(neck) > 40 },
      airwayClass: airway || null,
      fastingSolidsAt: hoursAgo(solidsH),
      fastingClearsAt: hoursAgo(clearsH),
      allergies: allergies.trim() || null,
      baselineSpo2: numOrNull(spo2),
      oxygenDelivery: oxygen || null,
    };
    setBusy(true);
    try {
      const r = await fetch('/api/v1/cases', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
      const j = (await r.json()) as { id?: string; error?: string };
      if (!r.ok || !j.id) throw new Error(j.error ?? `could not open the case (${r.status})`);
      router.push(`/cases/${j.id}`);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
      setBusy(false);
    }
  };

  return (
    <form onSubmit={submit} className="open-case" noValidate>
      <section className="panel">
        <h2>Patient</h2>
        {patient ? (
          <p data-testid="chosen-patient">
            <strong>{patient.familyName.toUpperCase()}, {patient.givenName}</strong> · {patient.mrn} · born {patient.birthDate} · {patient.sex}{' '}
            <button type="button" onClick={() => setPatient(null)}>Change</button>
          </p>
        ) : !adding ? (
          <>
            <label htmlFor="pq">Record number or name</label>
            <input id="pq" value={q} onChange={(e) => setQ(e.target.value)} autoFocus autoComplete="off" placeholder="e.g. KBD-000123 or Smith" />
            <ul className="plain results">
              {found.map((p) => (
                <li key={p.id}>
                  <button type="button" className="result" onClick={() => setPatient(p)}>
                    {p.familyName.toUpperCase()}, {p.givenName} · {p.mrn} · {p.birthDate} · {p.sex}
                  </button>
                </li>
              ))}
              {q.trim().length >= 2 && found.length === 0 && <li className="muted">No patient found.</li>}
            </ul>
            <button type="button" onClick={() => { setAdding(true); setNp({ ...np, mrn: /\d/.test(q) ? q.trim() : '', familyName: /\d/.test(q) ? '' : q.trim() }); }} data-testid="add-patient">
              Add a new patient
            </button>
          </>
        ) : (
          <div className="form-grid">
            <div><label htmlFor="np-mrn">Record number</label><input id="np-mrn" value={np.mrn} onChange={(e) => setNp({ ...np, mrn: e.target.value })} /></div>
            <div><label htmlFor="np-family">Family name</label><input id="np-family" value={np.familyName} onChange={(e) => setNp({ ...np, familyName: e.target.value })} /></div>
            <div><label htmlFor="np-given">Given name</label><input id="np-given" value={np.givenName} onChange={(e) => setNp({ ...np, givenName: e.target.value })} /></div>
            <div><label htmlFor="np-birth">Birth date</label><input id="np-birth" type="date" value={np.birthDate} onChange={(e) => setNp({ ...np, birthDate: e.target.value })} /></div>
            <div>
              <label htmlFor="np-sex">Sex</label>
              <select id="np-sex" value={np.sex} onChange={(e) => setNp({ ...np, sex: e.target.value })}>
                <option value="">choose</option>
                <option value="female">female</option>
                <option value="male">male</option>
                <option value="other">other</option>
                <option value="unknown">unknown</option>
              </select>
            </div>
            <div><button type="button" onClick={() => setAdding(false)}>Search instead</button></div>
          </div>
        )}
      </section>

      <section className="panel">
        <h2>Procedure</h2>
        <div className="form-grid">
          <div>
            <label htmlFor="proc">Procedure</label>
            <select id="proc" value={procedureType} onChange={(e) => setProcedure(e.target.value)}>
              {options.procedures.map((p) => <option key={p.code} value={p.code}>{p.label}</option>)}
            </select>
          </div>
          <div>
            <label htmlFor="room">Room</label>
            <select id="room" value={roomId} onChange={(e) => setRoom(e.target.value)}>
              {options.rooms.map((r) => <option key={r.id} value={r.id}>{r.name}</option>)}
            </select>
          </div>
          <div>
            <label htmlFor="procist">Proceduralist</label>
            <select id="procist" value={proceduralistId} onChange={(e) => setProceduralist(e.target.value)}>
              <option value="">not set</option>
              {options.proceduralists.map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
            </select>
          </div>
        </div>
        <fieldset className="choice">
          <legend>Planned depth (ASA continuum)</legend>
          {DEPTHS.map((d) => (
            <label key={d} className={depth === d ? 'chip on' : 'chip'}>
              <input type="radio" name="depth" value={d} checked={depth === d} onChange={() => setDepth(d)} />
              {DEPTH_LABEL[d]}
            </label>
          ))}
          <p className="small muted">{DEPTH_MEANING[depth as keyof typeof DEPTH_MEANING]}</p>
        </fieldset>
      </section>

      <section className="panel">
        <h2>Risk</h2>
        <fieldset className="choice">
          <legend>ASA physical status</legend>
          {ASA_CLASSES.map((c) => (
            <label key={c} className={asa === c ? 'chip on' : 'chip'} title={ASA_MEANING[c]}>
              <input type="radio" name="asa" value={c} checked={asa === c} onChange={() => setAsa(c)} />
              {c}
            </label>
          ))}
          <label className={asaE ? 'chip on' : 'chip'}>
            <input type="checkbox" checked={asaE} onChange={(e) => setAsaE(e.target.checked)} /> E (emergency)
          </label>
          <p className="small muted">{asa ? `ASA ${asa}: ${ASA_MEANING[asa as keyof typeof ASA_MEANING]}` : 'Choose a class; its definition shows here.'}</p>
        </fieldset>
        <div className="form-grid">
          <div><label htmlFor="wt">Weight (kg)</label><input id="wt" inputMode="decimal" value={weight} onChange={(e) => setWeight(e.target.value)} /></div>
          <div><label htmlFor="ht">Height (cm)</label><input id="ht" inputMode="decimal" value={height} onChange={(e) => setHeight(e.target.value)} /></div>
          <div><label htmlFor="bmi">BMI</label><output id="bmi" className="big-out" data-testid="bmi">{b ?? '–'}</output></div>
          <div><label htmlFor="neck">Neck (cm, optional)</label><input id="neck" inputMode="decimal" value={neck} onChange={(e) => setNeck(e.target.value)} /></div>
        </div>
        <fieldset className="stopbang">
          <legend>STOP-Bang</legend>
          {STOP_ITEMS.map((k) => (
            <div key={k} className="yn">
              <span title={STOP_BANG_SPECS[k].question}>{STOP_BANG_SPECS[k].label}</span>
              {[true, false].map((v) => (
                <label key={String(v)} className={stop[k] === v ? 'chip on' : 'chip'}>
                  <input type="radio" name={`sb-${k}`} checked={stop[k] === v} onChange={() => setStop({ ...stop, [k]: v })} />
                  {v ? 'yes' : 'no'}
                </label>
              ))}
            </div>
          ))}
          <p data-testid="stopbang-result">
            {sb ? (
              <>
                Score <strong>{sb.score}</strong>/8 · <strong>{STOP_BANG_BAND_LABEL[sb.band]}</strong>
                {sb.unknown.length > 0 && <span className="muted small"> · not yet known: {sb.unknown.map((u) => STOP_BANG_SPECS[u].label).join(', ')} (score may be higher)</span>}
              </>
            ) : (
              <span className="muted">Answer the four questions; BMI, age, neck and sex come from the facts.</span>
            )}
          </p>
        </fieldset>
        <fieldset className="choice">
          <legend>Airway (Mallampati)</legend>
          {['I', 'II', 'III', 'IV'].map((c) => (
            <label key={c} className={airway === c ? 'chip on' : 'chip'}>
              <input type="radio" name="airway" checked={airway === c} onChange={() => setAirway(c)} /> {c}
            </label>
          ))}
        </fieldset>
        <div className="form-grid">
          <div><label htmlFor="fs">Hours since solids</label><input id="fs" inputMode="decimal" value={solidsH} onChange={(e) => setSolidsH(e.target.value)} /></div>
          <div><label htmlFor="fc">Hours since clear fluids</label><input id="fc" inputMode="decimal" value={clearsH} onChange={(e) => setClearsH(e.target.value)} /></div>
          <div><label htmlFor="spo2b">Baseline SpO2 (%)</label><input id="spo2b" inputMode="decimal" value={spo2} onChange={(e) => setSpo2(e.target.value)} /></div>
          <div>
            <label htmlFor="o2">Oxygen delivery</label>
            <select id="o2" value={oxygen} onChange={(e) => setOxygen(e.target.value)}>
              {['room air', 'nasal cannula 2 L/min', 'nasal cannula 4 L/min', 'capnography nasal cannula 2 L/min', 'face mask 6 L/min', 'high-flow nasal oxygen'].map((o) => <option key={o}>{o}</option>)}
            </select>
          </div>
        </div>
        <label htmlFor="allergies">Allergies</label>
        <input id="allergies" value={allergies} onChange={(e) => setAllergies(e.target.value)} placeholder="none known" />
      </section>
      {error && <p className="error" role="alert">{error}</p>}
      <p>
        <button className="primary big" type="submit" disabled={busy} data-testid="open-case">{busy ? 'Opening…' : 'Open the case sheet'}</button>
      </p>
    </form>
  );
}
