/**
 * The web surface's security headers, in one place. proxy.ts (repo root) sets them on every
 * page and API response, with a fresh CSP nonce per page request; next.config.js sets the
 * static ones (nosniff, referrer policy, frame denial) on everything, static files included.
 *
 * The Content-Security-Policy allows no inline script: Next's own bootstrap and flight-data
 * scripts carry the per-request nonce (Next reads it from the request's CSP header), and
 * 'strict-dynamic' lets those load the chunks they need. Documented exceptions (docs/trust.md):
 *   - style-src 'unsafe-inline': React renders `style={{…}}` props as style attributes, and
 *     uPlot sets element styles; CSS cannot run script.
 *   - script-src 'unsafe-eval' only in `next dev` (React's dev tooling needs it), never in a build.
 *   - img-src data: blob: for the chart and inline SVG icons.
 */
export interface SecurityHeaderOptions {
  nonce?: string;
  dev?: boolean;
  /** Behind HTTPS (PLATEAU_SECURE_COOKIES=1): add Strict-Transport-Security. */
  https?: boolean;
}

export const HSTS = 'max-age=31536000; includeSubDomains';

/** The CSP for an HTML page, with the request's nonce. */
export function pageCsp(nonce: string, dev = false): string {
  return [
    `default-src 'self'`,
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    `style-src 'self' 'unsafe-inline'`,
    `img-src 'self' data: blob:`,
    `font-src 'self'`,
    `connect-src 'self'`,
    `worker-src 'self'`,
    `manifest-src 'self'`,
    `object-src 'none'`,
    `base-uri 'self'`,
    `form-action 'self'`,
    `frame-ancestors 'none'`,
  ].join('; ');
}

/** The CSP for JSON, PDF and CSV answers: nothing may load or frame them. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** Every security header for one response. */
export function securityHeaders(opts: SecurityHeaderOptions = {}): Record<string, string> {
  const h: Record<string, string> = {
    'Content-Security-Policy': opts.nonce ? pageCsp(opts.nonce, opts.dev) : API_CSP,
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'same-origin',
    'X-Frame-Options': 'DENY',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=(), usb=()',
  };
  if (opts.https) h['Strict-Transport-Security'] = HSTS;
  return h;
}

/** A fresh nonce: 128 random bits, base64. */
export function makeNonce(): string {
  const b = new Uint8Array(16);
  crypto.getRandomValues(b);
  return btoa(String.fromCharCode(...b));
}
