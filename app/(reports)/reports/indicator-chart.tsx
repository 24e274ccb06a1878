import type { IndicatorChart, IndicatorResult } from '@/lib/indicators';
import { formatNumber, unitLabel } from '@/lib/indicators';

const W = 640;
const H = 190;
const PAD = { left: 44, right: 10, top: 10, bottom: 26 };

/** The indicator's p chart (or run chart) as server-rendered SVG; periods before the first with cases are not drawn. */
export function IndicatorChartSvg({ ind }: { ind: IndicatorResult }) {
  const first = ind.series.findIndex((s) => s.denominator !== 0);
  const c: IndicatorChart = first > 0 ? { ...ind.chart, points: ind.chart.points.slice(first) } : ind.chart;
  const unit = ind.definition.unit;
  const values = c.points.flatMap((p) => [p.value, p.ucl]).filter((v): v is number => v !== null);
  if (c.centre !== null) values.push(c.centre);
  let max = values.length ? Math.max(...values) : 1;
  if (unit === 'percent') max = Math.min(100, Math.max(max, 10));
  max = max <= 0 ? 1 : max * 1.1;
  const iw = W - PAD.left - PAD.right;
  const ih = H - PAD.top - PAD.bottom;
  const step = c.points.length > 1 ? iw / (c.points.length - 1) : 0;
  const x = (i: number) => PAD.left + (c.points.length > 1 ? i * step : iw / 2);
  const y = (v: number) => PAD.top + ih - (Math.min(v, max) / max) * ih;
  const every = Math.max(1, Math.ceil(c.points.length / 12));

  const stepped = (key: 'lcl' | 'ucl') => {
    let d = '';
    let open = false;
    c.points.forEach((p, i) => {
      const v = p[key];
      if (v === null) {
        open = false;
        return;
      }
      const x0 = Math.max(PAD.left, x(i) - step / 2);
      const x1 = Math.min(PAD.left + iw, x(i) + step / 2);
      d += `${open ? 'L' : 'M'}${x0.toFixed(1)},${y(v).toFixed(1)}L${x1.toFixed(1)},${y(v).toFixed(1)}`;
      open = true;
    });
    return d;
  };
  let line = '';
  let open = false;
  c.points.forEach((p, i) => {
    if (p.value === null) {
      open = false;
      return;
    }
    line += `${open ? 'L' : 'M'}${x(i).toFixed(1)},${y(p.value).toFixed(1)}`;
    open = true;
  });
  const label = `${ind.definition.title}: ${c.kind === 'p' ? 'p chart' : 'run chart'} over ${c.points.length} periods`;

  return (
    <figure className="ind-chart">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={label}>
        <rect x={PAD.left} y={PAD.top} width={iw} height={ih} className="frame" />
        {[0, 0.5, 1].map((f) => (
          <g key={f}>
            <line x1={PAD.left} x2={PAD.left + iw} y1={y(max * f)} y2={y(max * f)} className="grid" />
            <text x={PAD.left - 4} y={y(max * f) + 3} textAnchor="end" className="tick">
              {formatNumber(max * f, unit)}
            </text>
          </g>
        ))}
        {c.points.map((p, i) =>
          i % every === 0 || i === c.points.length - 1 ? (
            <text key={p.period} x={x(i)} y={H - 8} textAnchor={c.points.length > 1 && i === c.points.length - 1 ? 'end' : c.points.length > 1 && i === 0 ? 'start' : 'middle'} className="tick">
              {p.short}
            </text>
          ) : null,
        )}
        {c.kind === 'p' && c.centre !== null && (
          <>
            <path d={stepped('ucl')} className="limit" />
            <path d={stepped('lcl')} className="limit" />
          </>
        )}
        {c.centre !== null && <line x1={PAD.left} x2={PAD.left + iw} y1={y(c.centre)} y2={y(c.centre)} className="centre" />}
        <path d={line} className="series" />
        {c.points.map((p, i) =>
          p.value === null ? null : (
            <circle key={p.period} cx={x(i)} cy={y(p.value)} r={p.signals.length ? 4.5 : 3} className={p.signals.length ? 'signal' : 'point'}>
              <title>{`${p.period}: ${formatNumber(p.value, unit)}${p.signals.length ? ` — signal: ${p.signals.join(', ')}` : ''}`}</title>
            </circle>
          ),
        )}
      </svg>
      <figcaption className="muted small">
        {c.kind === 'p'
          ? `p chart, ${unitLabel(unit)}: centre line ${c.centre === null ? 'not shown' : formatNumber(c.centre, unit)}, dashed 3-sigma limits, larger dots mark a special-cause signal. Suppressed periods are left out.`
          : `Run chart (seconds): centre line = median of the plotted values${c.centre === null ? '' : ` (${formatNumber(c.centre, 'seconds')} s)`}; larger dots mark a run of 8 on one side.`}
        {c.withheld && ` Note: ${c.withheld}.`}
      </figcaption>
    </figure>
  );
}
