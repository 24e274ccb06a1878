import { SignInInput } from '@/lib/domain/user';
import { checkCredentials } from '@/lib/server/auth';
import { checkOrigin, errorResponse, parseJson } from '@/lib/server/http';
import { endSession, requestOrigin, startSession } from '@/lib/server/session';

/** Sign in with JSON `{ username, password }`; sets the session cookie. */
export async function POST(req: Request) {
  try {
    checkOrigin(req);
    const input = await parseJson(req, SignInInput);
    const origin = await requestOrigin();
    const r = await checkCredentials(input.username, input.password, origin);
    if (!r.ok && r.lockedUntil) {
      const wait = Math.max(1, Math.ceil((r.lockedUntil.getTime() - Date.now()) / 1000));
      return Response.json({ error: r.error }, { status: 429, headers: { 'retry-after': String(wait) } });
    }
    if (!r.ok) return Response.json({ error: r.error }, { status: 401 });
    await startSession(r.userId, origin);
    return Response.json({ ok: true, role: r.role });
  } catch (e) {
    return errorResponse(e);
  }
}

/** Sign out. */
export async function DELETE(req: Request) {
  try {
    checkOrigin(req);
    await endSession();
    return Response.json({ ok: true });
  } catch (e) {
    return errorResponse(e);
  }
}
