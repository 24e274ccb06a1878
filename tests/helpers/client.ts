/* eslint-disable @typescript-eslint/no-explicit-any -- test responses are JSON of many shapes */
/** A tiny HTTP client that keeps the session cookie, like a browser would. */
export class Client {
  private cookie = '';
  constructor(public base: string) {}

  async req(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<{ status: number; json: any; text: string; headers: Headers }> {
    const h: Record<string, string> = { ...headers };
    if (this.cookie) h.cookie = this.cookie;
    if (body !== undefined && !h['content-type']) h['content-type'] = 'application/json';
    const r = await fetch(this.base + path, { method, headers: h, body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body), redirect: 'manual' });
    const set = r.headers.getSetCookie();
    for (const c of set) {
      const [pair] = c.split(';');
      if (pair.startsWith('plateau_session=')) this.cookie = pair.endsWith('=') ? '' : pair;
    }
    const text = await r.text();
    let json: unknown = null;
    try {
      json = JSON.parse(text);
    } catch {
      /* not JSON */
    }
    return { status: r.status, json, text, headers: r.headers };
  }

  /** A GET whose body is not JSON (PDF, CSV): the raw Response. */
  fetchRaw(path: string): Promise<Response> {
    return fetch(this.base + path, { headers: this.cookie ? { cookie: this.cookie } : {} });
  }

  get(path: string) {
    return this.req('GET', path);
  }
  post(path: string, body?: unknown, headers?: Record<string, string>) {
    return this.req('POST', path, body, headers);
  }

  async signIn(username: string, password: string) {
    const r = await this.post('/api/v1/session', { username, password });
    if (r.status !== 200) throw new Error(`sign-in failed for ${username}: ${r.status} ${r.text}`);
    return r;
  }
}
