'use client';
import { useActionState } from 'react';
import { signInAction, type SignInState } from './actions';

export function SignInForm() {
  const [state, action, pending] = useActionState<SignInState, FormData>(signInAction, { error: null, username: '' });
  return (
    <form action={action} className="panel" aria-describedby={state.error ? 'signin-error' : undefined}>
      <label htmlFor="username">Username</label>
      <input id="username" name="username" autoComplete="username" autoCapitalize="none" defaultValue={state.username} required autoFocus />
      <label htmlFor="password">Password</label>
      <input id="password" name="password" type="password" autoComplete="current-password" required />
      {state.error && (
        <p id="signin-error" className="error" role="alert">
          {state.error}
        </p>
      )}
      <p>
        <button className="primary" type="submit" disabled={pending} style={{ width: '100%' }}>
          {pending ? 'Signing in…' : 'Sign in'}
        </button>
      </p>
    </form>
  );
}
