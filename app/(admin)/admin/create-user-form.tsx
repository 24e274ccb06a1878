'use client';
import { useActionState } from 'react';
import { createUserAction, type CreateUserState } from './actions';

export function CreateUserForm() {
  const [state, action, pending] = useActionState<CreateUserState, FormData>(createUserAction, { error: null, created: null });
  return (
    <form action={action} className="panel" style={{ maxWidth: 480 }}>
      <h2>Add an account</h2>
      <label htmlFor="nu-username">Username</label>
      <input id="nu-username" name="username" required autoCapitalize="none" />
      <label htmlFor="nu-name">Display name</label>
      <input id="nu-name" name="displayName" required />
      <label htmlFor="nu-role">Role</label>
      <select id="nu-role" name="role" defaultValue="nurse">
        <option value="nurse">Sedation nurse</option>
        <option value="lead">Anaesthesia / sedation lead</option>
        <option value="safety">Safety officer</option>
        <option value="admin">Administrator</option>
      </select>
      <label htmlFor="nu-password">First password (10+ characters, letters and digits)</label>
      <input id="nu-password" name="password" type="password" required autoComplete="new-password" />
      {state.error && <p className="error" role="alert">{state.error}</p>}
      {state.created && <p className="ok" role="status">Account {state.created} created.</p>}
      <p><button className="primary" type="submit" disabled={pending}>{pending ? 'Saving…' : 'Create account'}</button></p>
    </form>
  );
}
