"use client";

import { useState } from "react";

export function AcceptInvitationForm({ token }: { token: string }) {
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    if (form.get("password") !== form.get("confirm")) return setError("The two passwords differ.");
    const res = await fetch("/api/v1/invitations/accept", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ token, password: form.get("password") }),
    });
    const body = await res.json();
    if (!res.ok) return setError(body.error?.fields?.password?.[0] ?? body.error?.message ?? "That did not work.");
    setDone(body.email);
  }

  if (done)
    return (
      <p role="status">
        Password set for {done}. <a href="/sign-in">Sign in</a>.
      </p>
    );
  return (
    <form onSubmit={onSubmit} className="flex flex-col gap-4">
      <label className="field">
        <span>New password</span>
        <input className="input" name="password" type="password" autoComplete="new-password" minLength={12} required />
      </label>
      <label className="field">
        <span>Repeat it</span>
        <input className="input" name="confirm" type="password" autoComplete="new-password" minLength={12} required />
      </label>
      {error && (
        <p role="alert" className="rounded border border-brick bg-brick-light px-3 py-2 text-sm text-brick-dark">
          {error}
        </p>
      )}
      <button className="btn justify-center" type="submit">
        Set password
      </button>
    </form>
  );
}
