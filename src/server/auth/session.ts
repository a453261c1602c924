import "server-only";
import { getServerSession } from "next-auth";
import { getToken } from "next-auth/jwt";
import { redirect } from "next/navigation";
import type { NextRequest } from "next/server";
import { env } from "@/env";
import type { Actor } from "@/lib/auth/authorize";
import { authOptions } from "./options";
import { loadActor } from "./load-actor";

/** For server components and pages: the signed-in actor, or a redirect to the sign-in page. */
export async function requireActor(): Promise<Actor> {
  const session = await getServerSession(authOptions);
  const actor = session?.user?.id ? await loadActor(session.user.id) : null;
  if (!actor) redirect("/sign-in");
  return actor;
}

/** For route handlers: read the signed session cookie from the request itself. */
export async function actorFromRequest(req: NextRequest): Promise<Actor | null> {
  const token = await getToken({ req, secret: env.NEXTAUTH_SECRET, secureCookie: env.NEXTAUTH_URL.startsWith("https:") });
  return token?.sub ? loadActor(token.sub) : null;
}
