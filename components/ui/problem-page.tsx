import Link from "next/link";

export interface ProblemPageProps {
  title: string;
  message: string;
  /** Where "back" goes: the dashboard inside the app, the home page outside. */
  homeHref?: string;
  homeLabel?: string;
  children?: React.ReactNode;
}

/** Our own page for a refusal, a missing page or a failure: what happened and a way on. */
export function ProblemPage({
  title,
  message,
  homeHref = "/",
  homeLabel = "Go to the home page",
  children,
}: ProblemPageProps) {
  return (
    <div
      role="alert"
      className="mx-auto max-w-2xl rounded-card border border-slate-200 bg-white p-8"
    >
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="mt-2 text-slate-700">{message}</p>
      {children}
      <p className="mt-6 flex flex-wrap gap-4">
        <Link className="font-semibold text-copper-700 underline" href={homeHref}>
          {homeLabel}
        </Link>
        <Link className="font-semibold text-copper-700 underline" href="/loop-check">
          Try the loop check
        </Link>
      </p>
    </div>
  );
}
