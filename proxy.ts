import { NextResponse, type NextRequest } from 'next/server';
import { makeNonce, securityHeaders } from '@/lib/server/securityHeaders';

/**
 * Security headers on every page and API response (lib/server/securityHeaders.ts). Pages get a
 * per-request CSP nonce: it is passed to Next on the request's Content-Security-Policy header,
 * and Next puts it on every script it renders, so no inline script without it runs.
 */
export function proxy(request: NextRequest) {
  const isApi = request.nextUrl.pathname.startsWith('/api/');
  const https = process.env.PLATEAU_SECURE_COOKIES === '1';
  const dev = process.env.NODE_ENV === 'development';
  const nonce = isApi ? undefined : makeNonce();
  const headers = securityHeaders({ nonce, dev, https });
  let response: NextResponse;
  if (nonce) {
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set('x-nonce', nonce);
    requestHeaders.set('Content-Security-Policy', headers['Content-Security-Policy']);
    response = NextResponse.next({ request: { headers: requestHeaders } });
  } else {
    // API answers need no nonce: leave the request as it came (cheaper on the busiest routes).
    response = NextResponse.next();
  }
  for (const [k, v] of Object.entries(headers)) response.headers.set(k, v);
  return response;
}

export const config = {
  matcher: [{ source: '/((?!_next/static|_next/image|icon.svg).*)' }],
};
