import Link from "next/link";
import { NavBar } from "./nav-bar";

const PUBLIC_LINKS = [
  { href: "/loop-check", label: "Loop check" },
  { href: "/#how-it-works", label: "How it works" },
  { href: "/sign-in", label: "Sign in" },
];

export function SiteHeader() {
  return (
    <NavBar
      brandHref="/"
      links={PUBLIC_LINKS}
      extra={
        <li>
          <Link
            href="/sign-up"
            className="inline-flex min-h-11 items-center rounded-lg bg-copper-600 px-4 py-2 font-semibold text-white hover:bg-copper-700"
          >
            Sign up
          </Link>
        </li>
      }
    />
  );
}

export function SiteFooter() {
  return (
    <footer className="mt-16 border-t border-slate-200 bg-white">
      <div className="mx-auto max-w-6xl space-y-3 px-4 py-6 text-sm text-slate-600">
        <nav aria-label="Footer">
          <ul className="flex flex-wrap gap-x-5 gap-y-2">
            <li>
              <Link className="underline" href="/loop-check">
                Loop check
              </Link>
            </li>
            <li>
              <Link className="underline" href="/sign-up">
                Sign up as a homeowner
              </Link>
            </li>
            <li>
              <Link className="underline" href="/sign-up?as=reviewer">
                Become a reviewer
              </Link>
            </li>
            <li>
              <Link className="underline" href="/sign-in">
                Sign in
              </Link>
            </li>
          </ul>
        </nav>
        <p>
          Loopwright is advisory. It never replaces local building codes, a licensed
          installer&apos;s sign-off or the manufacturer&apos;s instructions.
        </p>
      </div>
    </footer>
  );
}
