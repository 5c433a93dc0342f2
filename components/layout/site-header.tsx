import Link from "next/link";

export function SiteHeader() {
  return (
    <header className="border-b border-slate-200 bg-white">
      <nav
        aria-label="Main"
        className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-4 py-3"
      >
        <Link href="/" className="flex items-center gap-2 text-xl font-bold text-slate-900">
          <span
            aria-hidden
            className="inline-block h-7 w-7 rounded-full border-4 border-copper-500 bg-sun-300"
          />
          Loopwright
        </Link>
        <ul className="flex flex-wrap items-center gap-1 text-base">
          <li>
            <Link className="rounded-lg px-3 py-2 hover:bg-slate-100" href="/loop-check">
              Loop check
            </Link>
          </li>
          <li>
            <Link className="rounded-lg px-3 py-2 hover:bg-slate-100" href="/#how-it-works">
              How it works
            </Link>
          </li>
        </ul>
      </nav>
    </header>
  );
}

export function SiteFooter() {
  return (
    <footer className="mt-16 border-t border-slate-200 bg-white">
      <div className="mx-auto max-w-6xl px-4 py-6 text-sm text-slate-600">
        Loopwright is advisory. It never replaces local building codes, a licensed installer&apos;s
        sign-off or the manufacturer&apos;s instructions.
      </div>
    </footer>
  );
}
