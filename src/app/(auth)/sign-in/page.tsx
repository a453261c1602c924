import type { Metadata } from "next";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string }> }) {
  const { callbackUrl } = await searchParams;
  // Only same-site paths are followed after sign-in.
  const next = callbackUrl && callbackUrl.startsWith("/") && !callbackUrl.startsWith("//") ? callbackUrl : "/";
  return (
    <div className="card">
      <h1 className="mb-4">Sign in</h1>
      <SignInForm next={next} />
      <p className="mt-6 text-xs text-muted">
        Cairn holds pseudonymous subject codes only, never patient identities.
      </p>
    </div>
  );
}
