'use client';
import { useState } from 'react';
import { casesHref } from '@/lib/review/caseFilter';
import type { DimensionId } from '@/lib/review/dimensions';
import { ci, pct } from './format';

/** One breakdown row as the page sends it: cells are [cases with the figure, rate, lower, upper] per figure. */
export interface BreakdownRowData {
  key: string;
  label: string;
  cases: number;
  cells: [number, number | null, number, number][];
}

export interface BreakdownData {
  dimension: DimensionId;
  label: string;
  rows: BreakdownRowData[];
  total: BreakdownRowData;
}

/**
 * The breakdown tables, each in a <details>: a table is drawn only once opened, so the page
 * carries ten tables' numbers but not ten tables' markup. Every count links to its cases.
 */
export function BreakdownTables({ data, figures, period, csvHref, initiallyOpen = 2 }: {
  data: BreakdownData[];
  figures: { id: string; label: string }[];
  period: { from: string; to: string; month: string | null };
  csvHref: Record<string, string>;
  initiallyOpen?: number;
}) {
  const [open, setOpen] = useState<Set<string>>(() => new Set(data.slice(0, initiallyOpen).map((d) => d.dimension)));
  return (
    <>
      {data.map((b) => (
        <details
          key={b.dimension}
          open={open.has(b.dimension)}
          data-testid={`breakdown-${b.dimension}`}
          onToggle={(e) => {
            const isOpen = (e.currentTarget as HTMLDetailsElement).open;
            setOpen((s) => {
              if (isOpen === s.has(b.dimension)) return s;
              const n = new Set(s);
              if (isOpen) n.add(b.dimension);
              else n.delete(b.dimension);
              return n;
            });
          }}
        >
          <summary>{b.label}</summary>
          {open.has(b.dimension) && (
            <>
              <div className="section-head right">
                <a className="button small-button" href={csvHref[b.dimension]} download data-testid={`csv-breakdown-${b.dimension}`}>CSV</a>
              </div>
              <div className="table-scroll">
                <table className="breakdown">
                  <thead>
                    <tr>
                      <th>{b.label}</th>
                      <th className="num">Cases</th>
                      {figures.map((f) => <th key={f.id} className="num">{f.label}</th>)}
                    </tr>
                  </thead>
                  <tbody>
                    {[...b.rows, b.total].map((r) => {
                      const total = r === b.total;
                      const where = total ? {} : { dim: b.dimension, value: r.key };
                      return (
                        <tr key={r.key} className={total ? 'total' : undefined} data-testid={total ? 'breakdown-total' : 'breakdown-row'}>
                          <td>{r.label}</td>
                          <td className="num"><a href={casesHref(period, where)}>{r.cases}</a></td>
                          {figures.map((f, j) => {
                            const [x, rate, lower, upper] = r.cells[j];
                            return (
                              <td key={f.id} className="num" title={`${pct(rate)} · 95 % CI ${ci({ lower, upper, denominator: r.cases })}`}>
                                <a href={casesHref(period, { figure: f.id, ...where })}>{x}</a> <span className="muted">{pct(rate, 0)}</span>
                              </td>
                            );
                          })}
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
              </div>
            </>
          )}
        </details>
      ))}
    </>
  );
}
