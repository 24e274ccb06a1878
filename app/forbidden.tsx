import Link from 'next/link';

export default function Forbidden() {
  return (
    <main>
      <h1>Not for your role</h1>
      <p className="muted">Your account cannot open this page. Ask an administrator if you need it.</p>
      <p><Link href="/">Back to your start page</Link></p>
    </main>
  );
}
