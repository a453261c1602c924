import "server-only";
import argon2 from "argon2";

// argon2id with the library's defaults (64 MiB, t=3, p=4): memory-hard, per OWASP's password storage guidance.
export const hashPassword = (password: string) => argon2.hash(password, { type: argon2.argon2id });

export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) return false;
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

/** A fixed hash to verify against when the account does not exist, so timing does not tell. */
let dummyHash: Promise<string> | undefined;
export const dummyPasswordHash = () => (dummyHash ??= hashPassword("not-a-real-password-cairn"));
