// Plain HTTP to a served instance, for what a browser cannot show: the connection's own address
// (127.0.0.0/8 is all loopback on Linux, so each local address is its own client) and next-auth's
// sign-in and sign-out as a script does them (/api/auth/csrf, then the form post).
import { request } from "node:http";

export interface HttpAnswer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

export function http(
  base: string,
  path: string,
  { method = "GET", headers = {}, body, from = "127.0.0.1" }: { method?: string; headers?: Record<string, string>; body?: string; from?: string } = {},
): Promise<HttpAnswer> {
  const url = new URL(path, base);
  return new Promise((resolve, reject) => {
    const req = request({ host: url.hostname, port: url.port, path: url.pathname + url.search, method, headers, localAddress: from }, (res) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: text }));
    });
    req.on("error", reject);
    if (body) req.write(body);
    req.end();
  });
}

const cookiesOf = (a: HttpAnswer) => ([] as string[]).concat(a.headers["set-cookie"] ?? []).map((c) => c.split(";")[0]!);

async function csrf(base: string, from: string, cookie = ""): Promise<{ token: string; cookie: string }> {
  const res = await http(base, "/api/auth/csrf", { from, headers: cookie ? { cookie } : {} });
  const { csrfToken } = JSON.parse(res.body) as { csrfToken: string };
  return { token: csrfToken, cookie: [cookie, ...cookiesOf(res)].filter(Boolean).join("; ") };
}

/** next-auth's credentials sign-in; `session` is the session cookie (name=value) when it worked. */
export async function signInOverHttp(
  base: string,
  { email, password, from = "127.0.0.1", headers = {}, callbackUrl }: { email: string; password: string; from?: string; headers?: Record<string, string>; callbackUrl?: string },
) {
  const { token, cookie } = await csrf(base, from);
  const form = new URLSearchParams({ csrfToken: token, email, password, json: "true", ...(callbackUrl ? { callbackUrl } : {}) });
  const res = await http(base, "/api/auth/callback/credentials", {
    method: "POST",
    from,
    body: form.toString(),
    headers: { "content-type": "application/x-www-form-urlencoded", cookie, ...headers },
  });
  const url = res.status < 500 && res.body.startsWith("{") ? ((JSON.parse(res.body) as { url?: string }).url ?? "") : "";
  const error = url ? new URL(url).searchParams.get("error") : null;
  const session = cookiesOf(res).find((c) => c.startsWith("next-auth.session-token=")) ?? null;
  return { status: res.status, url, error, session };
}

/** next-auth's sign-out (POST /api/auth/signout) with this session cookie. */
export async function signOutOverHttp(base: string, session: string, from = "127.0.0.1"): Promise<number> {
  const { token, cookie } = await csrf(base, from, session);
  const res = await http(base, "/api/auth/signout", {
    method: "POST",
    from,
    body: new URLSearchParams({ csrfToken: token, json: "true" }).toString(),
    headers: { "content-type": "application/x-www-form-urlencoded", cookie },
  });
  return res.status;
}
