import { encode } from "next-auth/jwt";
import { NextRequest } from "next/server";

const secret = () => process.env.NEXTAUTH_SECRET ?? "cairn-development-secret-change-me";

/** A real signed next-auth session cookie for a user (what the browser would send). */
export async function sessionCookieFor(userId: string): Promise<string> {
  const token = await encode({ token: { sub: userId }, secret: secret() });
  return `next-auth.session-token=${token}`;
}

type Handler = (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** Call a route handler in-process, exactly as Next.js would, with an optional signed-in user. */
export async function callRoute(
  handler: Handler,
  { method = "GET", path = "/api/v1/test", params = {}, body, userId, query }: { method?: string; path?: string; params?: Record<string, string>; body?: unknown; userId?: string | null; query?: Record<string, string> },
) {
  const url = new URL(`http://127.0.0.1${path}`);
  for (const [k, v] of Object.entries(query ?? {})) url.searchParams.set(k, v);
  const headers = new Headers();
  if (userId) headers.set("cookie", await sessionCookieFor(userId));
  if (body !== undefined) headers.set("content-type", "application/json");
  const req = new NextRequest(url, { method, headers, body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body) });
  const res = await handler(req, { params: Promise.resolve(params) });
  const text = await res.text();
  let json: unknown = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = text;
  }
  return { status: res.status, json: json as any, headers: res.headers };
}
