import Link from "next/link";

export interface NavLink {
  href: string;
  label: string;
}

const linkClass = "inline-flex min-h-11 items-center rounded-lg px-3 py-2 hover:bg-slate-100";

export function Brand({ href }: { href: string }) {
  return (
    <Link href={href} className="flex items-center gap-2 text-xl font-bold text-slate-900">
      {/* eslint-disable-next-line @next/next/no-img-element -- a small static SVG, no optimisation needed */}
      <img src="/icon.svg" alt="" width={28} height={28} className="h-7 w-7" />
      Loopwright
    </Link>
  );
}

/**
 * The header's links: in a row from the md breakpoint, behind a "Menu" button on phones.
 * The phone menu is a native <details>, so it opens without JavaScript.
 */
export function NavBar({
  brandHref,
  links,
  extra,
}: {
  brandHref: string;
  links: NavLink[];
  /** Items after the links (unread count, who is signed in, sign-out). */
  extra?: React.ReactNode;
}) {
  const items = (
    <>
      {links.map((n) => (
        <li key={n.href}>
          <Link className={linkClass} href={n.href}>
            {n.label}
          </Link>
        </li>
      ))}
      {extra}
    </>
  );
  return (
    <header className="border-b border-slate-200 bg-white">
      <div className="mx-auto flex max-w-6xl items-center justify-between gap-3 px-4 py-3">
        <Brand href={brandHref} />
        <nav aria-label="Main" className="hidden md:block">
          <ul className="flex flex-wrap items-center justify-end gap-1 text-base">{items}</ul>
        </nav>
        <details className="group relative md:hidden" data-testid="phone-menu">
          <summary className="inline-flex min-h-11 cursor-pointer list-none items-center gap-2 rounded-lg border border-slate-300 px-3 py-2 font-semibold [&::-webkit-details-marker]:hidden">
            <span aria-hidden className="text-lg leading-none">
              ☰
            </span>
            Menu
          </summary>
          <nav
            aria-label="Main (phone)"
            className="absolute right-0 z-20 mt-2 w-64 rounded-xl border border-slate-200 bg-white p-2 shadow-lg"
          >
            <ul className="flex flex-col gap-1 text-base">{items}</ul>
          </nav>
        </details>
      </div>
    </header>
  );
}
