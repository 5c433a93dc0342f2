/** Sign in through next-auth's own endpoints over HTTP and return the cookies to send. */
export async function signInHttp(
  baseUrl: string,
  email: string,
  password: string,
): Promise<{ status: number; cookie: string; setCookie: string[] }> {
  const csrfRes = await fetch(`${baseUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const [k, ...v] = pair!.split("=");
      jar.set(k!, v.join("="));
    }
  };
  keep(csrfRes);
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: {
      "content-type": "application/x-www-form-urlencoded",
      cookie: [...jar].map(([k, v]) => `${k}=${v}`).join("; "),
    },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const setCookie = res.headers.getSetCookie();
  keep(res);
  return {
    status: res.status,
    cookie: [...jar].map(([k, v]) => `${k}=${v}`).join("; "),
    setCookie,
  };
}
