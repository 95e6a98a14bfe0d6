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
  { href: "/review", label: "Review" },
  { href: "/parts", label: "Parts" },
  { href: "/captures", label: "Captures" },
  { href: "/team", label: "Team" },
];

/** The bar on every signed-in page: mark, team, main nav, who you are and your role. */
export function AppHeader({ user }: { user: HeaderUser }) {
  return (
    <header className="border-b border-paper-line bg-paper-card">
      <div className="rw-shell flex items-center gap-x-3 px-4 py-2 sm:px-6 md:gap-x-5" data-testid="app-header-row">
        <div className="flex min-w-0 flex-1 items-center gap-3 md:flex-none">
          <Link href="/boards" aria-label="Railwise home" className="shrink-0">
            <Wordmark />
          </Link>
          <span aria-hidden className="h-5 w-px shrink-0 bg-paper-line" />
          {/* A long team name wraps onto a second line on a phone rather than losing its end. */}
          <span
            className="min-w-0 text-[12px] leading-tight break-words text-ink-soft sm:text-[13px]"
            title={`Team: ${user.teamName}`}
          >
            {user.teamName}
          </span>
        </div>
        <div className="hidden md:block">
          <NavLinks items={NAV} />
        </div>
        <div className="flex shrink-0 items-center gap-2.5 md:ml-auto">
          <span className="hidden truncate text-[13px] text-ink lg:inline" title={user.email ?? undefined}>
            {user.name ?? user.email}
          </span>
          <RoleBadge role={user.role} />
          <Link
            href="/signout"
            // -mr-2: the words, not the hover box, end at the column's edge (as the page's buttons do).
            className="-mr-2 rounded-md px-2 py-1 text-[13px] whitespace-nowrap text-ink-mute hover:bg-paper-sunk hover:text-ink"
          >
            Sign out
          </Link>
        </div>
      </div>
      {/* Narrow screens: the nav gets its own row (scrolls sideways if it must), so the first never wraps. */}
      <div className="overflow-x-auto border-t border-paper-line/70 px-4 py-1.5 sm:px-6 md:hidden">
        <NavLinks items={NAV} />
      </div>
    </header>
  );
}
