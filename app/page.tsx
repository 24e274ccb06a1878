import { redirect } from 'next/navigation';
import { requireAccess } from '@/lib/server/access';
import { HOME_FOR_ROLE } from '@/lib/server/roles';

export default async function Home() {
  const user = await requireAccess('/');
  redirect(HOME_FOR_ROLE[user.role]);
}
