import { endSession } from '@/lib/server/session';
import { checkOrigin, errorResponse } from '@/lib/server/http';

export async function POST(req: Request) {
  try {
    checkOrigin(req);
    await endSession();
    return new Response(null, { status: 303, headers: { location: '/sign-in' } });
  } catch (e) {
    return errorResponse(e);
  }
}
