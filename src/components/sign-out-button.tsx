"use client";

import { signOut } from "next-auth/react";
import { LogOut } from "lucide-react";

export function SignOutButton() {
  return (
    <button type="button" className="btn-secondary" onClick={() => signOut({ callbackUrl: "/sign-in" })}>
      <LogOut aria-hidden size={14} /> Sign out
    </button>
  );
}
