import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { authOptions, SIGN_IN_MESSAGES } from "@/server/auth/options";
import { hashPassword } from "@/server/auth/password";
import { MAX_FAILURES } from "@/server/auth/throttle";
import { signInAttempts, users } from "@/server/db/schema";
import { db } from "../../support/db";

type Authorize = (credentials: Record<string, string>, req: { headers: Record<string, string> }) => Promise<{ id: string } | null>;
const provider = authOptions.providers[0] as unknown as { options: { authorize: Authorize } };
const authorize = (email: string, password: string) => provider.options.authorize({ email, password }, { headers: {} });

let email: string;
const password = "correct horse battery staple";

beforeAll(async () => {
  email = `signin.${randomUUID().slice(0, 8)}@test.example`;
  await db.insert(users).values({ email, name: "Sign In Tester", passwordHash: await hashPassword(password) });
});

describe("sign-in with e-mail and password", () => {
  it("accepts the right password and records the attempt", async () => {
    const user = await authorize(email, password);
    expect(user?.id).toBeTruthy();
    const attempts = await db.select().from(signInAttempts).where(eq(signInAttempts.email, email));
    expect(attempts.some((a) => a.succeeded)).toBe(true);
  });

  it("refuses a wrong password with a message", async () => {
    await expect(authorize(email, "wrong password")).rejects.toThrow(SIGN_IN_MESSAGES.invalid);
  });

  it("gives an unknown account the same message as a wrong password", async () => {
    await expect(authorize(`nobody.${randomUUID()}@test.example`, "whatever")).rejects.toThrow(SIGN_IN_MESSAGES.invalid);
  });

  it("throttles after repeated failures, even for the right password", async () => {
    const target = `throttle.${randomUUID().slice(0, 8)}@test.example`;
    await db.insert(users).values({ email: target, name: "Throttle Tester", passwordHash: await hashPassword(password) });
    for (let i = 0; i < MAX_FAILURES; i++) await expect(authorize(target, `wrong-${i}`)).rejects.toThrow(SIGN_IN_MESSAGES.invalid);
    await expect(authorize(target, password)).rejects.toThrow(SIGN_IN_MESSAGES.throttled);
  });
});
