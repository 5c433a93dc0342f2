import Link from "next/link";
import { clsx } from "clsx";

/*
 * Colours and sizes are chosen with `variant` and `size`, never overridden through `className`
 * (which only adds: width, margins, print rules). So the classes are joined with clsx, without
 * tailwind-merge, which would add 8 kB of script to every page with a button or an error view.
 */
const variants = {
  primary: "bg-copper-600 text-white hover:bg-copper-700 disabled:bg-copper-300",
  secondary: "border border-slate-300 bg-white text-slate-900 hover:bg-slate-100",
  ghost: "text-copper-700 hover:bg-copper-50",
  /** Deleting something: a red outline. */
  danger: "border border-level-stop bg-white text-level-stop hover:bg-level-stop-bg",
  /** Deleting one item of a list: red words only. */
  "danger-ghost": "text-level-stop hover:bg-level-stop-bg",
} as const;

export type ButtonVariant = keyof typeof variants;

const sizes = {
  md: "min-h-12 text-base",
  /** 44 px high, in tables, rows and small forms. */
  compact: "min-h-11 text-base",
  small: "min-h-11 text-sm",
} as const;

export type ButtonSize = keyof typeof sizes;

const base =
  "inline-flex items-center justify-center gap-2 rounded-lg px-5 py-2.5 font-semibold transition-colors disabled:cursor-not-allowed";

interface Look {
  variant?: ButtonVariant;
  size?: ButtonSize;
}

export type ButtonProps = React.ButtonHTMLAttributes<HTMLButtonElement> & Look;

export function Button({ variant = "primary", size = "md", className, ...props }: ButtonProps) {
  return <button className={clsx(base, variants[variant], sizes[size], className)} {...props} />;
}

export function ButtonLink({
  variant = "primary",
  size = "md",
  className,
  ...props
}: React.ComponentProps<typeof Link> & Look) {
  return <Link className={clsx(base, variants[variant], sizes[size], className)} {...props} />;
}
