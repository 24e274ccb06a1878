import { forbidden, redirect } from 'next/navigation';
import { ACCESS, type AccessKey } from './policy';
import { currentUser, type SessionUser } from './session';
import type { Role } from './roles';

/** For pages: the signed-in user allowed on `key`, else a redirect to sign-in or a 403 page. */
export async function requireAccess(key: AccessKey): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect('/sign-in');
  if (!(ACCESS[key] as readonly Role[]).includes(user.role)) forbidden();
  return user;
}

/** For route handlers: the user, or a 401/403 JSON response to return as is. */
export async function authorizeApi(key: AccessKey): Promise<SessionUser | Response> {
  const user = await currentUser();
  if (!user) return Response.json({ error: 'sign in required' }, { status: 401 });
  if (!(ACCESS[key] as readonly Role[]).includes(user.role)) return Response.json({ error: `the ${user.role} role may not do this` }, { status: 403 });
  return user;
}
