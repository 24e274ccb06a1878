import { notFound } from 'next/navigation';
import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { draftNote, listNoteVersions } from '@/lib/db/notes';
import { loadCaseSheet } from '@/lib/db/caseSheet';
import { NotFoundError } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { allows } from '@/lib/server/policy';
import { TopBar } from '../../../../top-bar';
import { NoteView } from './note-view';

export const dynamic = 'force-dynamic';

export default async function NotePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireAccess('/cases/[id]/note');
  const { id } = await params;
  const t = now();
  let draft;
  try {
    draft = await draftNote(db(), id, t);
  } catch (e) {
    if (e instanceof NotFoundError) notFound();
    throw e;
  }
  const [versions, sheet] = await Promise.all([listNoteVersions(db(), id), loadCaseSheet(db(), id, 0, t)]);
  if (!sheet) notFound();
  return (
    <>
      <TopBar user={user} />
      <main className="wide">
        <p>
          <Link href={`/cases/${id}`}>← Case sheet</Link>
        </p>
        <NoteView
          caseId={id}
          status={draft.status}
          draft={draft.note}
          versions={versions.map((v) => ({ id: v.id, version: v.version, kind: v.kind, reason: v.reason, note: v.note, author: v.author, authorRole: v.authorRole, createdAt: v.createdAt, cosignRequired: v.cosignRequired, cosignedBy: v.cosignedBy, cosignedAt: v.cosignedAt }))}
          sheet={{ samples: sheet.samples.channels, episodes: sheet.analysis?.episodes ?? [], startMs: new Date(sheet.case.startAt).getTime(), timeZone: sheet.case.unit.timeZone, etco2Unit: sheet.case.etco2Unit, doses: sheet.doses.filter((d) => !d.voided).map((d) => ({ at: d.at, label: `${d.drug} ${d.amount}` })) }}
          can={{ sign: allows('POST /api/v1/cases/[id]/note/sign', user.role), amend: allows('POST /api/v1/cases/[id]/note/amend', user.role), cosign: allows('POST /api/v1/cases/[id]/note/cosign', user.role), fhir: allows('GET /api/v1/cases/[id]/fhir', user.role) }}
        />
      </main>
    </>
  );
}
