'use client';
import { useState } from 'react';
import { ruleSetSchema } from '@/lib/domain/ruleSet';
import { zodMessage } from '@/lib/_shared/zodMessage';

/**
 * Edit a rule set as JSON, starting from a copy; checked against the rule-set schema as you go
 * and saved as a new immutable version (the server assigns the version).
 */
export function RuleSetEditor({ initial, compareHref }: { initial: string; compareHref: string }) {
  const [text, setText] = useState(initial);
  const [state, setState] = useState<{ kind: 'idle' | 'ok' | 'error' | 'saved'; message: string }>({ kind: 'idle', message: '' });
  const [savedRef, setSavedRef] = useState<string | null>(null);

  function check(): unknown | null {
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      setState({ kind: 'error', message: `Not valid JSON: ${e instanceof Error ? e.message : ''}` });
      return null;
    }
    const r = ruleSetSchema.safeParse(json);
    if (!r.success) {
      setState({ kind: 'error', message: zodMessage(r.error) });
      return null;
    }
    setState({ kind: 'ok', message: `Valid: ${r.data.rules.length} rules.` });
    return r.data;
  }

  async function save() {
    const rs = check();
    if (!rs) return;
    const r = await fetch('/api/v1/rule-sets', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ruleSet: rs }) });
    const body = await r.json().catch(() => ({}));
    if (r.status === 201 || r.status === 200) {
      const ref = `${body.id}@${body.version}`;
      setSavedRef(ref);
      setState({ kind: 'saved', message: r.status === 201 ? `Saved as ${body.id} version ${body.version}.` : `Same as the saved ${body.id} version ${body.version}; nothing new saved.` });
    } else {
      setState({ kind: 'error', message: body.error ?? `Not saved (HTTP ${r.status}).` });
    }
  }

  return (
    <div className="rule-set-editor" data-testid="rule-set-editor">
      <label htmlFor="rule-set-json">Rule set (JSON)</label>
      <textarea id="rule-set-json" value={text} onChange={(e) => setText(e.target.value)} spellCheck={false} />
      <div className="row" style={{ marginTop: 8 }}>
        <button type="button" onClick={check}>Check</button>
        <button type="button" className="primary" onClick={save} data-testid="save-rule-set">Save as a new version</button>
        {savedRef && <a className="button" href={`${compareHref}&rs=${encodeURIComponent(savedRef)}`}>Compare with {savedRef}</a>}
      </div>
      {state.kind !== 'idle' && (
        <p className={state.kind === 'error' ? 'error' : 'ok'} role={state.kind === 'error' ? 'alert' : 'status'} data-testid="rule-set-state">{state.message}</p>
      )}
    </div>
  );
}
