'use client';
import { useState } from 'react';
import { REVIEW_CATEGORIES, REVIEW_CATEGORY_LABEL, REVIEW_CATEGORY_MEANING, REVIEW_STATUS_LABEL, REVIEW_STATUSES, type ReviewCategory, type ReviewStatus } from '@/lib/domain/review';

export interface ReviewFormValue {
  status: ReviewStatus;
  category: ReviewCategory | null;
  comment: string | null;
  followUp: string | null;
  reviewer: string | null;
  updatedAt: string;
  version: number;
}

/**
 * The lead's review of one case: status, contributing-factor category, comment and follow-up.
 * Sends the version it was opened at; a 409 (someone saved in between) keeps the typed text and
 * says what happened instead of overwriting.
 */
export function ReviewForm({ caseId, initial }: { caseId: string; initial: ReviewFormValue | null }) {
  const [saved, setSaved] = useState<ReviewFormValue | null>(initial);
  const [status, setStatus] = useState<ReviewStatus>(initial?.status ?? 'to_review');
  const [category, setCategory] = useState<string>(initial?.category ?? '');
  const [comment, setComment] = useState(initial?.comment ?? '');
  const [followUp, setFollowUp] = useState(initial?.followUp ?? '');
  const [state, setState] = useState<{ kind: 'idle' | 'saving' | 'saved' | 'error' | 'stale'; message?: string }>({ kind: 'idle' });

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setState({ kind: 'saving' });
    try {
      const r = await fetch(`/api/v1/review/cases/${encodeURIComponent(caseId)}`, {
        method: 'PUT',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ status, category: category || null, comment, followUp, version: saved?.version ?? 0 }),
      });
      const body = await r.json().catch(() => ({}));
      if (r.status === 200) {
        setSaved(body.review);
        setState({ kind: 'saved', message: body.changed ? `Saved (version ${body.review.version}).` : 'No change to save.' });
      } else if (r.status === 409) {
        setState({ kind: 'stale', message: body.error ?? 'Someone else saved this review after you opened it.' });
      } else {
        setState({ kind: 'error', message: body.error ?? `Not saved (HTTP ${r.status}).` });
      }
    } catch {
      setState({ kind: 'error', message: 'Not saved: the server could not be reached. Try again.' });
    }
  }

  return (
    <form className="panel review-form" onSubmit={submit} aria-label="Case review" data-testid="review-form" id="review">
      <h2>Review</h2>
      {saved ? (
        <p className="muted small" data-testid="review-meta">
          Last saved by {saved.reviewer ?? 'unknown'} at {new Date(saved.updatedAt).toLocaleString('en-GB')} · version {saved.version}
        </p>
      ) : (
        <p className="muted small">Not reviewed yet.</p>
      )}
      <fieldset>
        <legend>Status</legend>
        {REVIEW_STATUSES.map((s) => (
          <label key={s} className={`chip${status === s ? ' on' : ''}`}>
            <input type="radio" name="status" value={s} checked={status === s} onChange={() => setStatus(s)} /> {REVIEW_STATUS_LABEL[s]}
          </label>
        ))}
      </fieldset>
      <label htmlFor="review-category">Contributing factor</label>
      <select id="review-category" value={category} onChange={(e) => setCategory(e.target.value)}>
        <option value="">— choose —</option>
        {REVIEW_CATEGORIES.map((c) => (
          <option key={c} value={c}>{REVIEW_CATEGORY_LABEL[c]}</option>
        ))}
      </select>
      {category && <p className="muted small">{REVIEW_CATEGORY_MEANING[category as ReviewCategory]}</p>}
      <label htmlFor="review-comment">Comment</label>
      <textarea id="review-comment" value={comment} onChange={(e) => setComment(e.target.value)} maxLength={4000} />
      <label htmlFor="review-follow-up">Follow-up actions</label>
      <textarea id="review-follow-up" value={followUp} onChange={(e) => setFollowUp(e.target.value)} maxLength={4000} />
      <div className="row" style={{ marginTop: 10 }}>
        <button type="submit" className="primary" disabled={state.kind === 'saving'} data-testid="save-review">
          {state.kind === 'saving' ? 'Saving…' : 'Save review'}
        </button>
        {state.kind === 'saved' && <span className="saved" role="status" data-testid="review-saved">{state.message}</span>}
      </div>
      {(state.kind === 'error' || state.kind === 'stale') && (
        <div className="error" role="alert" data-testid="review-error">
          <p>{state.message}</p>
          {state.kind === 'stale' && <button type="button" onClick={() => location.reload()}>Reload the saved review</button>}
        </div>
      )}
    </form>
  );
}
