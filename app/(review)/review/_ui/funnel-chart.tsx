import type { Funnel } from '@/lib/review';

const C = { bg: '#1d2129', grid: '#343b48', text: '#a3aab8', title: '#e7e9ee', p0: '#e7e9ee', l95: '#8fd0e8', l998: '#c9a7ff', point: '#7fb7a4', alert: '#e8b46b', outlier: '#ef8a80' };
const W = 560;
const H = 300;
const M = { l: 46, r: 16, t: 28, b: 40 };

/**
 * A funnel plot as SVG: each person's proportion against their number of cases, the unit's rate
 * p0, and the exact binomial 95 % (dashed) and 99.8 % (solid) limits. Points outside 99.8 % are
 * red, outside 95 % amber; each point links to that person's cases with the figure.
 */
export function FunnelSvg({ id, title, funnel, hrefs }: { id: string; title: string; funnel: Funnel; hrefs: string[] }) {
  const maxN = Math.max(1, ...funnel.points.map((p) => p.n));
  const yMax = Math.min(1, Math.max(0.1, funnel.p0 * 3, ...funnel.points.map((p) => p.proportion)) * 1.1);
  const x = (n: number) => M.l + ((W - M.l - M.r) * n) / (maxN * 1.05);
  const y = (v: number) => M.t + (H - M.t - M.b) * (1 - Math.min(v, yMax) / yMax);
  const line = (level: number, side: 'lower' | 'upper') =>
    funnel.curve
      .map((c, i) => {
        const l = c.limits.find((x) => x.level === level);
        return l ? `${i ? 'L' : 'M'}${x(c.n).toFixed(1)},${y(l[side]).toFixed(1)}` : '';
      })
      .join('');
  const yTicks = [0, 0.25, 0.5, 0.75, 1].map((f) => f * yMax);
  const xTicks = [0, 0.25, 0.5, 0.75, 1].map((f) => Math.round(f * maxN));
  return (
    <svg id={id} viewBox={`0 0 ${W} ${H}`} width="100%" role="img" aria-label={`${title}: funnel plot`} fontFamily="system-ui, sans-serif" fontSize="11" data-testid="funnel-chart">
      <rect x="0" y="0" width={W} height={H} fill={C.bg} />
      <text x={M.l} y="16" fill={C.title} fontSize="12" fontWeight="600">{title}</text>
      <defs>
        <clipPath id={`${id}-clip`}>
          <rect x={M.l} y={M.t} width={W - M.l - M.r} height={H - M.t - M.b} />
        </clipPath>
      </defs>
      {yTicks.map((t) => (
        <g key={`y${t}`}>
          <line x1={M.l} x2={W - M.r} y1={y(t)} y2={y(t)} stroke={C.grid} pointerEvents="none" />
          <text x={M.l - 6} y={y(t) + 4} fill={C.text} textAnchor="end">{`${(t * 100).toFixed(0)}%`}</text>
        </g>
      ))}
      {xTicks.map((t) => (
        <text key={`x${t}`} x={x(t)} y={H - M.b + 16} fill={C.text} textAnchor="middle">{t}</text>
      ))}
      <text x={(W + M.l) / 2} y={H - 8} fill={C.text} textAnchor="middle">cases (n)</text>
      <g clipPath={`url(#${id}-clip)`} fill="none" pointerEvents="none">
        <path d={line(0.95, 'upper')} stroke={C.l95} strokeDasharray="4 3" />
        <path d={line(0.95, 'lower')} stroke={C.l95} strokeDasharray="4 3" />
        <path d={line(0.998, 'upper')} stroke={C.l998} />
        <path d={line(0.998, 'lower')} stroke={C.l998} />
        <line x1={M.l} x2={W - M.r} y1={y(funnel.p0)} y2={y(funnel.p0)} stroke={C.p0} />
      </g>
      <text x={M.l + 4} y={y(funnel.p0) - 4} fill={C.p0}>{`unit ${(funnel.p0 * 100).toFixed(1)} %`}</text>
      {funnel.points.map((p, i) => (
        <a key={p.key} href={hrefs[i]} data-testid="funnel-point" data-flag={p.flag ?? 'none'} data-x={p.x} data-label={p.label}>
          <title>{`${p.label}: ${p.x}/${p.n} = ${(p.proportion * 100).toFixed(1)} %${p.flag ? ` · outside the ${p.flag === 'outlier' ? '99.8' : '95'} % limits` : ''}`}</title>
          <circle cx={x(p.n)} cy={y(p.proportion)} r="6" fill={p.flag === 'outlier' ? C.outlier : p.flag === 'alert' ? C.alert : C.point} stroke={C.bg} strokeWidth="1.5" />
          <text x={x(p.n) + 8} y={y(p.proportion) + 4} fill={C.text} fontSize="10">{p.label.replace(/^(Dr|Ms|Mr|Mrs) /, '').split(' ').map((w) => w[0]).join('')}</text>
        </a>
      ))}
    </svg>
  );
}
