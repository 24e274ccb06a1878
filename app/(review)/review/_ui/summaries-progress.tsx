'use client';
import { useRouter } from 'next/navigation';
import { useState } from 'react';

/**
 * Computes a rule set's missing summaries for the period in batches (POST
 * /api/v1/rule-sets/summaries), showing progress, then reloads the comparison.
 */
export function SummariesProgress({ ruleSet, from, to, missing, total }: { ruleSet: string; from: string; to: string; missing: number; total: number }) {
  const router = useRouter();
  const [left, setLeft] = useState(missing);
  const [running, setRunning] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function run() {
    setRunning(true);
    setError(null);
    let remaining = left;
    try {
      while (remaining > 0) {
        const r = await fetch('/api/v1/rule-sets/summaries', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ruleSet, from, to, limit: 10 }) });
        const body = await r.json().catch(() => ({}));
        if (r.status !== 200) throw new Error(body.error ?? `HTTP ${r.status}`);
        if (body.computed === 0 && body.remaining > 0) throw new Error('no progress; try again');
        remaining = body.remaining;
        setLeft(remaining);
      }
      router.refresh();
    } catch (e) {
      setError(e instanceof Error ? e.message : 'failed');
    } finally {
      setRunning(false);
    }
  }

  const done = total - left;
  return (
    <div className="panel" data-testid="summaries-progress">
      <p>
        {left} of {total} cases have no summary under {ruleSet} yet. They are computed once and stored by rule-set version, so the next comparison is quick.
      </p>
      <div className="progress" aria-label="Summaries computed" role="progressbar" aria-valuemin={0} aria-valuemax={total} aria-valuenow={done}>
        <div style={{ width: `${total ? (100 * done) / total : 100}%` }} />
      </div>
      <div className="row" style={{ marginTop: 8 }}>
        <button type="button" className="primary" onClick={run} disabled={running || left === 0} data-testid="compute-summaries">
          {running ? `Computing… ${done}/${total}` : `Compute ${left} summaries`}
        </button>
      </div>
      {error && <p className="error" role="alert">{error}</p>}
    </div>
  );
}
