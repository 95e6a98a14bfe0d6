"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cx } from "@/components/ui/cx";

export interface NavItem {
  href: string;
  label: string;
  /** Path prefixes that count as "here" besides href itself (e.g. a scenario belongs to Boards). */
  also?: string[];
}

export function NavLinks({ items }: { items: NavItem[] }) {
  const path = usePathname() ?? "";
  return (
    <nav aria-label="Main" className="flex items-center gap-1">
      {items.map((item) => {
        const here = [item.href, ...(item.also ?? [])].some((p) => path === p || path.startsWith(`${p}/`));
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={here ? "page" : undefined}
            className={cx(
              "rounded-md px-2.5 py-1 text-[13px] font-medium",
              here ? "bg-paper-sunk text-ink" : "text-ink-mute hover:bg-paper-sunk hover:text-ink",
            )}
          >
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}
