import Link from "next/link";
import { RoleBadge, type Role } from "@/components/ui/badge";
import { Wordmark } from "./brand-mark";
import { NavLinks, type NavItem } from "./nav-links";

export interface HeaderUser {
  name?: string | null;
  email?: string | null;
  role: Role;
  teamName: string;
}

const NAV: NavItem[] = [
  { href: "/boards", label: "Boards", also: ["/scenarios", "/runs"] },
  { href: "/parts", label: "Parts" },
  { href: "/captures", label: "Captures" },
  { href: "/team", label: "Team" },
];

/** The bar on every signed-in page: mark, team, main nav, who you are and your role. */
export function AppHeader({ user }: { user: HeaderUser }) {
  return (
    <header className="border-b border-paper-line bg-paper-card">
      <div className="mx-auto flex max-w-7xl items-center gap-x-5 px-4 py-2 sm:px-6">
        <div className="flex min-w-0 items-center gap-3">
          <Link href="/boards" aria-label="Railwise home" className="shrink-0">
            <Wordmark />
          </Link>
          <span aria-hidden className="hidden h-5 w-px bg-paper-line sm:block" />
          <span className="hidden truncate text-[13px] text-ink-soft sm:inline" title="Team">
            {user.teamName}
          </span>
        </div>
        <div className="hidden sm:block">
          <NavLinks items={NAV} />
        </div>
        <div className="ml-auto flex min-w-0 items-center gap-2.5">
          <span className="hidden truncate text-[13px] text-ink md:inline" title={user.email ?? undefined}>
            {user.name ?? user.email}
          </span>
          <RoleBadge role={user.role} />
          <Link href="/signout" className="rounded-md px-2 py-1 text-[13px] whitespace-nowrap text-ink-mute hover:bg-paper-sunk hover:text-ink">
            Sign out
          </Link>
        </div>
      </div>
      {/* Phones: nav and team on a second row, so the first never wraps. */}
      <div className="flex items-center justify-between gap-3 border-t border-paper-line/70 px-4 py-1.5 sm:hidden">
        <NavLinks items={NAV} />
        <span className="truncate text-[12px] text-ink-mute">{user.teamName}</span>
      </div>
    </header>
  );
}
