"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** The Documents section's own tabs (binder, matrix, review, types, all files). */
export function DocumentsTabs({ tabs }: { tabs: { href: string; label: string }[] }) {
  const path = usePathname();
  const active = [...tabs].sort((a, b) => b.href.length - a.href.length).find((t) => path === t.href || path.startsWith(`${t.href}/`));
  return (
    <nav aria-label="Documents" className="flex flex-wrap gap-1 border-b border-rule">
      {tabs.map((t) => {
        const current = active?.href === t.href;
        return (
          <Link
            key={t.href}
            href={t.href}
            aria-current={current ? "page" : undefined}
            className={`-mb-px border-b-2 px-3 py-1.5 text-sm ${current ? "border-lichen font-semibold text-ink" : "border-transparent text-muted hover:text-ink"}`}
          >
            {t.label}
          </Link>
        );
      })}
    </nav>
  );
}
