import type { SeriesPoint } from '@/lib/review';

/** Colours are attributes, not CSS, so a downloaded SVG looks the same outside the page. */
const C = { bg: '#1d2129', grid: '#343b48', text: '#a3aab8', line: '#7fb7a4', centre: '#e7e9ee', limit: '#8fd0e8', outside: '#ef8a80', run: '#e8b46b' };

const W = 560;
const H = 230;
const M = { l: 46, r: 14, t: 28, b: 40 };

/**
 * A p chart as a small SVG: each month's proportion, the centre line p̄, and the 3-sigma limits
 * per month (they step with n). Points beyond a limit are red, points in a run of 8 on one side
 * amber; a month with no cases is left empty; each point links to its month's cases.
 */
export function PChartSvg({ id, title, points, hrefs, centre }: { id: string; title: string; points: SeriesPoint[]; hrefs: string[]; centre: number | null }) {
  const plotted = points.filter((p) => p.value !== null);
  const top = Math.max(0.05, ...plotted.map((p) => Math.max(p.value ?? 0, p.ucl ?? 0))) * 1.1;
  const yMax = Math.min(1, top);
  const band = (W - M.l - M.r) / Math.max(1, points.length);
  const x = (i: number) => M.l + band * (i + 0.5);
  const y = (v: number) => M.t + (H - M.t - M.b) * (1 - v / yMax);
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((f) => f * yMax);
  const step = (key: 'ucl' | 'lcl') =>
    points
      .map((p, i) => (p[key] === null ? '' : `M${(x(i) - band / 2).toFixed(1)},${y(p[key]!).toFixed(1)}H${(x(i) + band / 2).toFixed(1)}`))
      .join('');
  return (
    <svg id={id} viewBox={`0 0 ${W} ${H}`} width="100%" role="img" aria-label={`${title}: p chart by month`} fontFamily="system-ui, sans-serif" fontSize="11" data-testid="p-chart">
      <rect x="0" y="0" width={W} height={H} fill={C.bg} />
      <text x={M.l} y="16" fill={C.centre} fontSize="12" fontWeight="600">{title}</text>
      {ticks.map((t) => (
        <g key={t}>
          <line x1={M.l} x2={W - M.r} y1={y(t)} y2={y(t)} stroke={C.grid} strokeWidth="1" pointerEvents="none" />
          <text x={M.l - 6} y={y(t) + 4} fill={C.text} textAnchor="end">{`${(t * 100).toFixed(t * 100 < 10 && t > 0 ? 1 : 0)}%`}</text>
        </g>
      ))}
      {points.map((p, i) => (
        <text key={p.month} x={x(i)} y={H - M.b + 16} fill={C.text} textAnchor="middle">{p.month.slice(2)}</text>
      ))}
      <text x={W - M.r} y="16" fill={C.text} textAnchor="end">p̄ {centre === null ? '—' : `${(centre * 100).toFixed(1)} %`} · limits ± 3σ</text>
      <path d={step('ucl')} stroke={C.limit} strokeWidth="1.2" strokeDasharray="4 3" fill="none" pointerEvents="none" />
      <path d={step('lcl')} stroke={C.limit} strokeWidth="1.2" strokeDasharray="4 3" fill="none" pointerEvents="none" />
      {centre !== null && <line x1={M.l} x2={W - M.r} y1={y(centre)} y2={y(centre)} stroke={C.centre} strokeWidth="1" pointerEvents="none" />}
      <polyline
        points={points.map((p, i) => (p.value === null ? null : `${x(i).toFixed(1)},${y(p.value).toFixed(1)}`)).filter(Boolean).join(' ')}
        stroke={C.line}
        strokeWidth="1.5"
        fill="none"
        pointerEvents="none"
      />
      {points.map((p, i) =>
        p.value === null ? null : (
          <a key={p.month} href={hrefs[i]} data-testid="p-point" data-month={p.month} data-rules={p.rules.join(' ')}>
            <title>{`${p.month}: ${p.x}/${p.n} = ${(p.value * 100).toFixed(1)} % (limits ${((p.lcl ?? 0) * 100).toFixed(1)}–${((p.ucl ?? 0) * 100).toFixed(1)} %)${p.rules.length ? ` · special cause: ${p.rules.join(', ')}` : ''}${p.partial ? ' · month not complete' : ''}`}</title>
            <circle
              cx={x(i)}
              cy={y(p.value)}
              r={p.rules.length ? 5.5 : 4}
              fill={p.partial ? C.bg : p.rules.includes('outsideLimits') ? C.outside : p.rules.includes('sameSideRun') ? C.run : C.line}
              stroke={p.rules.includes('outsideLimits') ? C.outside : p.rules.includes('sameSideRun') ? C.run : C.line}
              strokeWidth="2"
            />
            <text x={x(i)} y={H - M.b + 28} fill={C.text} textAnchor="middle" fontSize="10">{`n ${p.n}`}</text>
          </a>
        ),
      )}
    </svg>
  );
}
