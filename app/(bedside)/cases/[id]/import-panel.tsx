'use client';
export function ImportPanel(_props: { caseId: string; startMs: number; timeZone: string; disabled: boolean; imports: { id: string; fileName: string; samples: number; createdAt: string }[] }) {
  return <p className="muted">Monitor import is being wired.</p>;
}
