/** A signed-in client over real HTTP (cookie jar + CSRF token), for tests that run the compiled server. */
export async function httpSession(base: string, email: string, password = 'fluxwalk-demo') {
  const jar = new Map<string, string>();
  let token = '';
  const call = async (method: string, path: string, body?: unknown) => {
    const headers: Record<string, string> = { cookie: [...jar].map(([k, v]) => `${k}=${v}`).join('; '), accept: 'application/json' };
    if (body !== undefined) headers['content-type'] = 'application/json';
    if (token && method !== 'GET') headers['x-csrf-token'] = token;
    const res = await fetch(base + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    for (const c of res.headers.getSetCookie()) {
      const [kv] = c.split(';');
      const i = kv.indexOf('=');
      jar.set(kv.slice(0, i).trim(), kv.slice(i + 1));
    }
    const text = await res.text();
    return { status: res.status, json: text ? JSON.parse(text) : null };
  };
  token = (await call('GET', '/api/auth/csrf')).json.token;
  const login = await call('POST', '/api/auth/login', { email, password });
  if (login.status !== 200) throw new Error(`sign-in failed: ${login.status}`);
  token = (await call('GET', '/api/auth/csrf')).json.token;
  return call;
}
