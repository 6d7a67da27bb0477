"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import type { NavItem } from "@/lib/permissions";

export function NavLinks({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  // The deepest matching entry is the current one, so /bench/parts marks "My parts", not "Bench".
  const current = items
    .filter((i) => pathname === i.href || pathname.startsWith(`${i.href}/`))
    .sort((a, b) => b.href.length - a.href.length)[0]?.href;
  return (
    <ul className="flex flex-wrap gap-1" aria-label="Main">
      {items.map((item) => {
        const active = item.href === current;
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={active ? "page" : undefined}
              className={`rounded-md px-3 py-1.5 text-sm ${active ? "bg-ink text-sheet" : "text-ink-soft hover:bg-sheet hover:text-ink"}`}
            >
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
