import type { Cell, IndicatorReport, IndicatorResult } from '@/lib/indicators';
import { differenceUnit, formatCount, formatPeriod, suppressionText, unitLabel } from '@/lib/indicators';
import { IndicatorChartSvg } from './indicator-chart';

function rate(c: Cell) {
  return c.display.interval ? `${c.display.value} (${c.display.interval})` : c.display.value;
}

function SummaryTable({ report }: { report: IndicatorReport }) {
  return (
    <table className="ind-summary" data-testid="indicator-summary">
      <thead>
        <tr>
          <th>Indicator</th>
          <th>Numerator / denominator</th>
          <th>Value (95 % CI)</th>
          <th>Previous {report.previousPeriod.label}</th>
          <th>Year earlier {report.yearEarlierPeriod.label}</th>
        </tr>
      </thead>
      <tbody>
        {report.indicators.map((ind) => (
          <tr key={ind.id} data-indicator={ind.id}>
            <td>
              <a href={`#ind-${ind.id}`}>{ind.definition.title}</a>
              <span className="muted small block">{unitLabel(ind.definition.unit)}</span>
            </td>
            <td className="num">{ind.definition.kind === 'proportion' ? `${ind.current.display.numerator} / ${ind.current.display.denominator}` : `n = ${ind.current.display.denominator}`}</td>
            <td className="num">{rate(ind.current)}</td>
            <td className="num">
              {rate(ind.previous.cell)}
              <span className="muted small block">{ind.previous.display}</span>
            </td>
            <td className="num">
              {rate(ind.yearEarlier.cell)}
              <span className="muted small block">{ind.yearEarlier.display}</span>
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function IndicatorSection({ ind, report, refs }: { ind: IndicatorResult; report: IndicatorReport; refs: string[] | null }) {
  const d = ind.definition;
  const q = d.kind === 'quantile';
  const rows: [string, Cell, string][] = [
    [`This period ${report.period.label}`, ind.current, '—'],
    [`Previous ${report.previousPeriod.label}`, ind.previous.cell, ind.previous.display],
    [`Year earlier ${report.yearEarlierPeriod.label}`, ind.yearEarlier.cell, ind.yearEarlier.display],
  ];
  const reasons = [...new Set(rows.map(([, c]) => c.suppressed).filter((s): s is NonNullable<typeof s> => s !== null))];
  return (
    <section className="panel ind" id={`ind-${ind.id}`} data-indicator={ind.id}>
      <h2>{d.title}</h2>
      <p className="muted small">
        {unitLabel(d.unit)} · {d.higherIsBetter ? 'higher is better' : 'lower is better'} · id <code>{d.id}</code>
      </p>
      <div className="ind-body">
        <table className="ind-table">
          <thead>
            <tr>
              <th>Period</th>
              {!q && <th>Numerator</th>}
              <th>{q ? 'n (cases)' : 'Denominator'}</th>
              <th>{q ? `${d.p === 0.5 ? 'Median' : '90th percentile'} (s)` : `Rate (${unitLabel(d.unit)})`}</th>
              {!q && <th>95 % CI</th>}
              <th>This period minus row ({differenceUnit(d.unit)})</th>
            </tr>
          </thead>
          <tbody>
            {rows.map(([label, c, diff]) => (
              <tr key={label}>
                <td>{label}</td>
                {!q && <td className="num">{c.display.numerator}</td>}
                <td className="num">{c.display.denominator}</td>
                <td className="num">{c.display.value}</td>
                {!q && <td className="num">{c.display.interval}</td>}
                <td className="num">{diff}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <IndicatorChartSvg ind={ind} />
      </div>
      {reasons.map((s) => (
        <p key={s} className="muted small">
          Suppressed: {suppressionText(s, report.minCell, d.kind)}.
        </p>
      ))}
      {ind.excluded.length > 0 && (
        <p className="muted small">
          Left out of the denominator in {report.period.label}: {ind.excluded.map((e) => `${e.reason}: ${formatCount(e.count)}`).join('; ')}.
        </p>
      )}
      <details>
        <summary>Definition</summary>
        <p>{d.definition}</p>
        <dl className="ind-def">
          <dt>{q ? 'Statistic' : 'Numerator'}</dt>
          <dd>{d.numerator}</dd>
          <dt>Denominator</dt>
          <dd>{d.denominator}</dd>
          <dt>Inclusion</dt>
          <dd>
            <ul>
              {d.inclusion.map((t) => (
                <li key={t}>{t}</li>
              ))}
            </ul>
          </dd>
          <dt>Sources</dt>
          <dd>{d.sources.join('; ')}</dd>
        </dl>
      </details>
      {refs && (
        <details data-testid={`refs-${ind.id}`}>
          <summary>Counted cases ({refs.length}) — opaque references, for the lead</summary>
          <p className="refs">{refs.length ? refs.map((r) => <code key={r}>{r}</code>) : <span className="muted">none</span>}</p>
        </details>
      )}
    </section>
  );
}

/** A period report (live or frozen): facts, summary table, one section per indicator. */
export function ReportView({ report, refs }: { report: IndicatorReport; refs?: Record<string, string[]> | null }) {
  return (
    <>
      <section className="panel">
        <div className="facts">
          <div>
            <span>Period</span>
            {formatPeriod(report.period)} ({report.period.start} to {report.period.end})
          </div>
          <div>
            <span>Scope</span>
            {report.scope.label}
          </div>
          <div>
            <span>Signed cases in the period</span>
            {formatCount(report.cases)}
          </div>
          <div>
            <span>Catalogue · rule set</span>
            version {report.catalogueVersion} · {report.ruleSet.id} v{report.ruleSet.version}
          </div>
          <div>
            <span>Smallest published count</span>
            {report.minCell} (counts 1–{report.minCell - 1} shown as “&lt; {report.minCell}”)
          </div>
          <div>
            <span>{report.issue ? 'Issued' : 'Computed'}</span>
            {report.issue ? `version ${report.issue.version}, ${report.issue.issuedOn}, ${report.issue.issuedBy}` : `${report.generatedOn} (draft, not issued)`}
          </div>
        </div>
      </section>
      <section className="panel">
        <h2>Summary</h2>
        <SummaryTable report={report} />
      </section>
      {report.indicators.map((ind) => (
        <IndicatorSection key={ind.id} ind={ind} report={report} refs={refs ? (refs[ind.id] ?? []) : null} />
      ))}
    </>
  );
}
