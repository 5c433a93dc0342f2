import Link from "next/link";
import type { CurrentUser } from "@/lib/server/auth/session";
import { SignOutButton } from "./sign-out-button";

export interface NavItem {
  href: string;
  label: string;
}

/** What each role can reach; a reviewer sees the board only once verified. */
export function navFor(user: CurrentUser, reviewerVerified: boolean): NavItem[] {
  const common = [{ href: "/dashboard", label: "Dashboard" }];
  if (user.role === "homeowner")
    return [
      ...common,
      { href: "/projects/new", label: "New project" },
      { href: "/loop-check", label: "Loop check" },
      { href: "/settings/notifications", label: "E-mail settings" },
    ];
  if (user.role === "reviewer")
    return [
      ...common,
      ...(reviewerVerified ? [{ href: "/board", label: "Request board" }] : []),
      { href: "/reviewer/profile", label: "Profile" },
      { href: "/reviewer/credentials", label: "Credentials" },
      { href: "/reviewer/earnings", label: "Earnings" },
      { href: "/settings/notifications", label: "E-mail settings" },
    ];
  return [
    ...common,
    { href: "/admin/credentials", label: "Verification queue" },
    { href: "/admin/disputes", label: "Disputes" },
    { href: "/admin/ledger", label: "Ledger" },
    { href: "/admin/outbox", label: "E-mail outbox" },
  ];
}

export function AppHeader({
  user,
  nav,
  unread = 0,
}: {
  user: CurrentUser;
  nav: NavItem[];
  unread?: number;
}) {
  return (
    <header className="border-b border-slate-200 bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3">
        <Link
          href="/dashboard"
          className="flex items-center gap-2 text-xl font-bold text-slate-900"
        >
          <span
            aria-hidden
            className="inline-block h-7 w-7 rounded-full border-4 border-copper-500 bg-sun-300"
          />
          Loopwright
        </Link>
        <nav aria-label="Main">
          <ul className="flex flex-wrap items-center gap-1 text-base">
            {nav.map((n) => (
              <li key={n.href}>
                <Link
                  className="inline-flex min-h-11 items-center rounded-lg px-3 py-2 hover:bg-slate-100"
                  href={n.href}
                >
                  {n.label}
                </Link>
              </li>
            ))}
            {unread > 0 ? (
              <li>
                <span
                  data-unread={unread}
                  className="rounded-full bg-sun-300 px-2.5 py-0.5 text-sm font-bold text-slate-900"
                >
                  {unread} unread {unread === 1 ? "message" : "messages"}
                </span>
              </li>
            ) : null}
            <li className="px-2 text-sm text-slate-500">
              {user.displayName} · {user.role}
            </li>
            <li>
              <SignOutButton />
            </li>
          </ul>
        </nav>
      </div>
    </header>
  );
}
