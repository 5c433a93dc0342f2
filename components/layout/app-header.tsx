import type { CurrentUser } from "@/lib/server/auth/session";
import { SignOutButton } from "./sign-out-button";
import { NavBar } from "./nav-bar";
import { ROLE_LABELS } from "@/lib/labels";

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
    <NavBar
      brandHref="/dashboard"
      links={nav}
      extra={
        <>
          {unread > 0 ? (
            <li className="px-2 py-1">
              <span
                data-unread={unread}
                className="rounded-full bg-sun-300 px-2.5 py-0.5 text-sm font-bold text-slate-900"
              >
                {unread} unread {unread === 1 ? "message" : "messages"}
              </span>
            </li>
          ) : null}
          <li className="px-3 py-1 text-sm text-slate-500">
            {user.displayName} · {ROLE_LABELS[user.role]}
          </li>
          <li>
            <SignOutButton />
          </li>
        </>
      }
    />
  );
}
