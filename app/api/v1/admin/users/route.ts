import { randomUUID } from 'node:crypto';
import { NewUserInput } from '@/lib/domain/user';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { hashPassword, passwordProblem } from '@/lib/server/password';
import { createUser, DuplicateUsernameError, listUsers } from '@/lib/db/users';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';
import { unitForUser } from '@/lib/server/unit';

export async function GET() {
  const user = await authorizeApi('GET /api/v1/admin/users');
  if (user instanceof Response) return user;
  return Response.json({ users: await listUsers(db()) });
}

export async function POST(req: Request) {
  const admin = await authorizeApi('POST /api/v1/admin/users');
  if (admin instanceof Response) return admin;
  try {
    checkOrigin(req);
    const input = await parseJson(req, NewUserInput);
    const problem = passwordProblem(input.password, input.username);
    if (problem) throw new HttpError(422, `password: ${problem}`);
    const unit = await unitForUser(admin);
    const u = await createUser(
      db(),
      { id: randomUUID(), username: input.username, displayName: input.displayName, role: input.role, passwordHash: await hashPassword(input.password), unitId: unit?.id ?? null },
      { id: admin.id, role: admin.role, origin: await requestOrigin() },
      now(),
    );
    return Response.json({ id: u.id, username: u.username, role: u.role }, { status: 201 });
  } catch (e) {
    if (e instanceof DuplicateUsernameError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
