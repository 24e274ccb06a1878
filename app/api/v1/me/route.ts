import { authorizeApi } from '@/lib/server/access';

export async function GET() {
  const user = await authorizeApi('GET /api/v1/me');
  if (user instanceof Response) return user;
  return Response.json({ id: user.id, username: user.username, displayName: user.displayName, role: user.role });
}
