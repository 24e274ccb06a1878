import { notFound } from 'next/navigation';
import { requireAccess } from '@/lib/server/access';
import { loadCaseSheet } from '@/lib/db/caseSheet';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { allows } from '@/lib/server/policy';
import { TopBar } from '../../../top-bar';
import { CaseSheet } from './case-sheet';

export const dynamic = 'force-dynamic';

export default async function CasePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireAccess('/cases/[id]');
  const { id } = await params;
  const sheet = await loadCaseSheet(db(), id, 0, now());
  if (!sheet) notFound();
  return (
    <>
      <TopBar user={user} />
      <main className="wide">
        <CaseSheet initial={sheet} canWrite={allows('POST /api/v1/cases/[id]/entries', user.role)} />
      </main>
    </>
  );
}
