// Helpers for specs that start an app server of their own (faults, upload faults): plain fetch, no
// Playwright request context, so they keep working while that server is killed and restarted.

/** Polls `url` until its status passes `ok` or `ms` run out; returns the last status (0 = no answer). */
export async function waitFor(url: string, ok: (s: number) => boolean, ms: number): Promise<number> {
  const until = Date.now() + ms;
  let last = 0;
  while (Date.now() < until) {
    last = await fetch(url).then((r) => r.status, () => 0);
    if (ok(last)) return last;
    await new Promise((r) => setTimeout(r, 250));
  }
  return last;
}

/** Signs in through next-auth's CSRF and credentials endpoints; returns the Cookie header to send. */
export async function signInAt(base: string, email: string, password: string): Promise<string> {
  const csrfRes = await fetch(`${base}/api/auth/csrf`);
  const cookies = csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookies.join("; ") },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
    redirect: "manual",
  });
  return [...cookies, ...res.headers.getSetCookie().map((c) => c.split(";")[0])].join("; ");
}
