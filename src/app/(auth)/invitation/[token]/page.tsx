import type { Metadata } from "next";
import { AcceptInvitationForm } from "./accept-invitation-form";

export const metadata: Metadata = { title: "Set your password" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <div className="card">
      <h1 className="mb-2">Set your password</h1>
      <p className="mb-4 text-sm text-muted">Choose a password of at least 12 characters. You will use it to sign in and to sign acknowledgements.</p>
      <AcceptInvitationForm token={token} />
    </div>
  );
}
