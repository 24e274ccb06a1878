import Link from 'next/link';

export default function NotFound() {
  return (
    <main>
      <h1>Not found</h1>
      <p className="muted">There is nothing at this address.</p>
      <p><Link href="/">Back to your start page</Link></p>
    </main>
  );
}
