'use client';
import { useRouter } from 'next/navigation';
import { useState } from 'react';

/** A lead turns an opaque report reference back into its case (audited by the API). */
export function ResolveRefForm({ reportId }: { reportId: string }) {
  const router = useRouter();
  const [ref, setRef] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    const r = await fetch(`/api/v1/reports/${encodeURIComponent(reportId)}/refs/${encodeURIComponent(ref.trim().toUpperCase())}`);
    const body = (await r.json().catch(() => ({}))) as { href?: string; error?: string };
    if (r.ok && body.href) router.push(body.href);
    else setError(body.error ?? `not found (HTTP ${r.status})`);
  };
  return (
    <form onSubmit={submit} className="row">
      <label htmlFor="ref-input" className="sr-only">
        Reference
      </label>
      <input id="ref-input" value={ref} onChange={(e) => setRef(e.target.value)} placeholder="R-XXXXXXXX" style={{ maxWidth: 220 }} required />
      <button type="submit">Open the case</button>
      {error && (
        <span className="error" role="alert">
          {error}
        </span>
      )}
    </form>
  );
}
