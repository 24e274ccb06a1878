'use client';
import { useRouter } from 'next/navigation';
import { useState } from 'react';

/** Issues the shown period and scope as a new frozen version (safety officer), then opens it. */
export function IssueButton({ period, scope, minCell }: { period: string; scope: 'all' | string[]; minCell: number }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const issue = async () => {
    setBusy(true);
    setError(null);
    try {
      const r = await fetch('/api/v1/reports', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ period, scope, minCell }) });
      const body = (await r.json().catch(() => ({}))) as { id?: string; error?: string };
      if (r.status === 201 && body.id) router.push(`/reports/issued/${body.id}`);
      else setError(body.error ?? `could not issue (HTTP ${r.status})`);
    } catch {
      setError('could not reach Plateau; nothing was issued');
    } finally {
      setBusy(false);
    }
  };
  return (
    <div>
      <button type="button" className="primary" onClick={issue} disabled={busy} data-testid="issue-report">
        {busy ? 'Issuing…' : `Issue ${period} as a frozen version`}
      </button>
      {error && (
        <p className="error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
