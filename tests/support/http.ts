import { inject } from "vitest";

/**
 * A small HTTP client with a cookie jar, for driving the app the way a
 * browser without JavaScript would: form posts, redirects not followed.
 */
export class Client {
  readonly baseUrl = inject("baseUrl");
  private cookies = new Map<string, string>();

  /**
   * `clientAddress` speaks as another client: the test server trusts one
   * proxy hop (TRUST_PROXY=1), as behind a load balancer, and reads the
   * address from X-Forwarded-For. Without it, the client is 127.0.0.1.
   */
  constructor(private readonly clientAddress?: string) {}

  private remember(response: Response) {
    for (const header of response.headers.getSetCookie()) {
      const [pair, ...attributes] = header.split(";");
      const [name, value] = pair.split("=");
      const expired =
        attributes.some((a) => /max-age=0/i.test(a.trim())) || value === "";
      if (expired) this.cookies.delete(name.trim());
      else this.cookies.set(name.trim(), value);
    }
  }

  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  async request(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size) headers.set("cookie", this.cookieHeader());
    if (this.clientAddress) headers.set("x-forwarded-for", this.clientAddress);
    const response = await fetch(`${this.baseUrl}${path}`, {
      ...init,
      headers,
      redirect: "manual",
    });
    this.remember(response);
    return response;
  }

  get(path: string) {
    return this.request(path);
  }

  post(path: string, fields: Record<string, string>) {
    return this.request(path, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams(fields).toString(),
    });
  }

  postJson(path: string, body: unknown, headers: Record<string, string> = {}) {
    return this.request(path, {
      method: "POST",
      headers: { "content-type": "application/json", ...headers },
      body: typeof body === "string" ? body : JSON.stringify(body),
    });
  }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<Response> {
    const response = await this.post("/sign-in", { email, password });
    if (response.status !== 302) {
      throw new Error(`sign-in as ${email} answered ${response.status}`);
    }
    return response;
  }
}

export const DEMO_PASSWORD = "larchmere-demo-2026";

/** The path part of a redirect's Location header. */
export function locationOf(response: Response): string {
  const location = response.headers.get("location") ?? "";
  return location.startsWith("http")
    ? new URL(location).pathname + new URL(location).search
    : location;
}

/** Messages the e-mail fake received, newest first. */
export async function outbox(): Promise<
  { id: string; to: string[]; subject: string; text: string }[]
> {
  const response = await fetch(`${inject("resendUrl")}/emails`);
  return (
    (await response.json()) as {
      data: { id: string; to: string[]; subject: string; text: string }[];
    }
  ).data;
}

export async function latestEmailTo(address: string) {
  return (
    (await outbox()).find((m) => m.to.includes(address.toLowerCase())) ?? null
  );
}

export function linkIn(text: string): string {
  const match = /https?:\/\/\S+/.exec(text);
  if (!match) throw new Error("no link in the message");
  return new URL(match[0]).pathname;
}
