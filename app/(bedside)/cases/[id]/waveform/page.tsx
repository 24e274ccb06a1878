import { notFound } from 'next/navigation';
import Link from 'next/link';
import { requireAccess } from '@/lib/server/access';
import { loadCaseSheet } from '@/lib/db/caseSheet';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { allows } from '@/lib/server/policy';
import { TopBar } from '../../../../top-bar';
import { WaveformViewer } from './waveform-viewer';

export const dynamic = 'force-dynamic';

/** The case's raw CO2 waveform: a zoomable strip with breath marks, findings and episodes. `?at=<s>` centres it. */
export default async function WaveformPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ at?: string }> }) {
  const user = await requireAccess('/cases/[id]/waveform');
  const { id } = await params;
  const sp = await searchParams;
  const sheet = await loadCaseSheet(db(), id, 0, now());
  if (!sheet) notFound();
  const at = sp.at !== undefined && Number.isFinite(Number(sp.at)) ? Number(sp.at) : null;
  const startMs = new Date(sheet.case.startAt).getTime();
  return (
    <>
      <TopBar user={user} />
      <main className="wide">
        <p>
          <Link href={`/cases/${id}`}>← Case sheet</Link>
        </p>
        <h1>CO2 waveform</h1>
        <WaveformViewer
          caseId={id}
          caseStartMs={startMs}
          timeZone={sheet.case.unit.timeZone}
          at={at}
          episodes={(sheet.analysis?.episodes ?? []).map((e) => ({ rule: e.rule, start: e.start, end: e.end }))}
          canImport={allows('POST /api/v1/cases/[id]/waveform', user.role) && sheet.case.status !== 'signed'}
        />
      </main>
    </>
  );
}
