import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { env } from "@/env";
import { db } from "@/server/db/client";
import { users } from "@/server/db/schema";
import { dummyPasswordHash, verifyPassword } from "./password";
import { isThrottled, recordAttempt } from "./throttle";

const credentialsSchema = z.object({ email: z.string().trim().toLowerCase().email(), password: z.string().min(1).max(500) });

export const SIGN_IN_MESSAGES = {
  invalid: "That e-mail and password do not match an account.",
  throttled: "Too many failed attempts. Wait 15 minutes, or ask your administrator to reset your password.",
} as const;

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: 8 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw, req) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new Error(SIGN_IN_MESSAGES.invalid);
        const { email, password } = parsed.data;
        const forwarded = req?.headers?.["x-forwarded-for"];
        const ip = typeof forwarded === "string" ? (forwarded.split(",")[0]?.trim() ?? null) : null;
        if (await isThrottled(email)) {
          await recordAttempt(email, false, ip);
          throw new Error(SIGN_IN_MESSAGES.throttled);
        }
        const user = await db.query.users.findFirst({ where: eq(users.email, email) });
        const ok = await verifyPassword(user?.passwordHash ?? (await dummyPasswordHash()), password);
        if (!user || !ok || user.disabledAt) {
          await recordAttempt(email, false, ip);
          throw new Error(SIGN_IN_MESSAGES.invalid);
        }
        await recordAttempt(email, true, ip);
        return { id: user.id, email: user.email, name: user.name };
      },
    }),
  ],
  callbacks: {
    // Only the user id travels in the signed cookie; roles are read from PostgreSQL per request.
    async jwt({ token, user }) {
      if (user) token.sub = user.id;
      return token;
    },
    async session({ session, token }) {
      if (session.user && token.sub) session.user.id = token.sub;
      return session;
    },
  },
};
