'use client';
import type { Analysis } from '@/lib/domain/episode';
import { ABRUPT_ZERO_HINT, LEVEL_LABEL, ruleLabel } from '@/lib/domain/ruleLabel';
import { INTERVENTION_LABEL } from '@/lib/domain/intervention';
import { clock } from './shared';

function dur(s: number): string {
  const m = Math.floor(s / 60);
  const r = Math.round(s - m * 60);
  return m ? `${m} min ${r} s` : `${r} s`;
}

/** Each episode the rules found: rule, start, duration, extreme, response and level, live. */
export function EpisodePanel({ analysis, startMs, timeZone, waveformHref = null }: { analysis: Analysis | null; startMs: number; timeZone: string; waveformHref?: string | null }) {
  if (!analysis) return <p className="muted">Analysis not available yet.</p>;
  const eps = analysis.episodes;
  return (
    <section className="panel episodes" aria-label="Respiratory episodes" data-testid="episode-panel">
      <h2>
        Episodes <span className="muted">({analysis.ruleSet.id} v{analysis.ruleSet.version})</span>
        <span className={`level level-${analysis.caseLevel}`} data-testid="case-level">{LEVEL_LABEL[analysis.caseLevel]}</span>
      </h2>
      {eps.length === 0 && <p className="muted">No episode so far.</p>}
      {eps.length > 0 && (
        <table>
          <thead>
            <tr>
              <th>Episode</th>
              <th>Start</th>
              <th>Duration</th>
              <th>Extreme</th>
              <th>First response</th>
              <th>Level</th>
            </tr>
          </thead>
          <tbody>
            {eps.map((e) => (
              <tr key={`${e.rule}-${e.start}`} data-testid="episode-row" data-rule={e.rule}>
                <td>
                  <strong>{ruleLabel(e.rule)}</strong>
                  {e.censored && <span className="muted" title="The data start or stop inside this episode, so it may be longer"> · cut off by a data gap</span>}
                  {e.onsetAbrupt && (
                    <p className="hint" role="note" data-testid="abrupt-hint">
                      {ABRUPT_ZERO_HINT}
                    </p>
                  )}
                </td>
                <td>
                  {clock(startMs + e.start * 1000, timeZone, true)}
                  {waveformHref && (
                    <>
                      {' '}
                      <a href={`${waveformHref}?at=${Math.round(e.start)}`} className="small">waveform</a>
                    </>
                  )}
                </td>
                <td>{dur(e.durationS)}</td>
                <td>{e.extremes.map((x) => `${x.kind === 'lowest' ? 'low' : 'high'} ${x.channel === 'etco2' ? 'EtCO2' : x.channel === 'spo2' ? 'SpO2' : x.channel.toUpperCase()} ${x.value} ${x.unit}`).join(', ')}</td>
                <td>{e.responseS === null ? <span className="muted">none recorded</span> : `${Math.round(e.responseS)} s · ${e.interventions.map((i) => INTERVENTION_LABEL[i.kind]).join(', ')}`}</td>
                <td><span className={`level level-${e.level}`}>{LEVEL_LABEL[e.level]}</span></td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {analysis.summary.majorPhysiology && <p className="warn-line">A prolonged apnea or prolonged/critical hypoxemia was found: confirm the interventions before signing.</p>}
      {analysis.skipped.length > 0 && <p className="muted small">Not evaluated: {analysis.skipped.map((s) => `${ruleLabel(s.rule)} (${s.reason})`).join('; ')}</p>}
    </section>
  );
}
