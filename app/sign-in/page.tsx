import { SignInForm } from './sign-in-form';

export const dynamic = 'force-dynamic';

export default function SignInPage() {
  return (
    <main className="signin">
      <h1>Plateau</h1>
      <p className="muted">Sedation record and respiratory-event review. Sign in with your unit account.</p>
      <SignInForm />
    </main>
  );
}
