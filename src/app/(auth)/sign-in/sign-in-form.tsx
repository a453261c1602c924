"use client";

import { signIn } from "next-auth/react";
import { useState } from "react";

export function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setPending(true);
    setError(null);
    const form = new FormData(e.currentTarget);
    const res = await signIn("credentials", { email: form.get("email"), password: form.get("password"), redirect: false });
    setPending(false);
    if (!res || res.error) {
      setError(res?.error && res.error !== "CredentialsSignin" ? res.error : "That e-mail and password do not match an account.");
      return;
    }
    window.location.assign(next);
  }

  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4" aria-describedby={error ? "sign-in-error" : undefined}>
      <label className="field">
        <span>E-mail</span>
        <input className="input" name="email" type="email" autoComplete="username" required />
      </label>
      <label className="field">
        <span>Password</span>
        <input className="input" name="password" type="password" autoComplete="current-password" required />
      </label>
      {error && (
        <p id="sign-in-error" role="alert" className="rounded border border-brick bg-brick-light px-3 py-2 text-sm text-brick-dark">
          {error}
        </p>
      )}
      <button className="btn justify-center" type="submit" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
