import { requireAccess } from '@/lib/server/access';
import { unitForUser } from '@/lib/server/unit';
import { caseFormOptions } from '@/lib/db/openCase';
import { db } from '@/lib/db/client';
import { TopBar } from '../../../top-bar';
import { OpenCaseForm } from './open-case-form';

export const dynamic = 'force-dynamic';

export default async function NewCasePage() {
  const user = await requireAccess('/cases/new');
  const unit = await unitForUser(user);
  if (!unit) {
    return (
      <>
        <TopBar user={user} />
        <main><p>No unit is set up yet.</p></main>
      </>
    );
  }
  const options = await caseFormOptions(db(), unit.id);
  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>Open a case</h1>
        <OpenCaseForm options={options} />
      </main>
    </>
  );
}
