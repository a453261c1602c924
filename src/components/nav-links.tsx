"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import {
  BookOpenText,
  Building2,
  CalendarCheck,
  FileStack,
  FileSignature,
  History,
  House,
  Landmark,
  ReceiptText,
  UserRound,
  Users,
  type LucideIcon,
} from "lucide-react";
import type { NavIcon } from "@/lib/nav";

const icons: Record<NavIcon, LucideIcon> = {
  home: House,
  protocol: BookOpenText,
  sites: Building2,
  subjects: UserRound,
  visits: CalendarCheck,
  budgets: ReceiptText,
  payments: Landmark,
  documents: FileStack,
  people: Users,
  audit: History,
  acknowledgements: FileSignature,
};

export function NavLinks({ items }: { items: { key: string; label: string; href: string; icon: NavIcon }[] }) {
  const pathname = usePathname();
  const home = items[0]?.href;
  return (
    <ul className="flex flex-col gap-0.5" data-testid="main-nav">
      {items.map((item) => {
        const Icon = icons[item.icon];
        const active = item.href === home ? pathname === item.href : pathname.startsWith(item.href);
        return (
          <li key={item.key}>
            <Link
              href={item.href}
              aria-current={active ? "page" : undefined}
              className={`flex items-center gap-2 rounded px-3 py-2 text-sm no-underline ${
                active ? "bg-lichen text-white" : "text-ink hover:bg-lichen-light"
              }`}
            >
              <Icon aria-hidden size={16} />
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
