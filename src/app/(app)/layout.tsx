import Link from "next/link";
import { Providers } from "@/components/providers";
import { SignOutButton } from "@/components/sign-out-button";
import { requireActor } from "@/server/auth/session";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const actor = await requireActor();
  return (
    <Providers>
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2">
        Skip to content
      </a>
      <header className="flex items-center justify-between border-b border-rule bg-white px-4 py-2">
        <Link href="/" className="text-xl font-bold tracking-tight text-lichen no-underline">
          Cairn
        </Link>
        <div className="flex items-center gap-3 text-sm">
          <span data-testid="signed-in-as">
            {actor.name} <span className="text-muted">({actor.email})</span>
          </span>
          <SignOutButton />
        </div>
      </header>
      {children}
    </Providers>
  );
}
