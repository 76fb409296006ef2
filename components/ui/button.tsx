import Link from "next/link";
import type { ComponentProps } from "react";

const VARIANTS = {
  primary: "bg-corona-500 text-umbra hover:bg-corona-400 disabled:bg-corona-200",
  secondary: "border border-ink-200 bg-white text-ink-800 hover:bg-ink-50 disabled:text-ink-300",
  quiet: "text-ink-700 hover:bg-ink-100",
  danger: "bg-caution-700 text-white hover:bg-caution-800",
} as const;

type Variant = keyof typeof VARIANTS;

const base =
  "inline-flex items-center justify-center gap-2 rounded-md px-4 py-2 text-sm font-semibold transition-colors disabled:cursor-not-allowed";

export function Button({
  variant = "primary",
  className = "",
  ...props
}: ComponentProps<"button"> & { variant?: Variant }) {
  return <button className={`${base} ${VARIANTS[variant]} ${className}`} {...props} />;
}

export function ButtonLink({
  variant = "primary",
  className = "",
  ...props
}: ComponentProps<typeof Link> & { variant?: Variant }) {
  return <Link className={`${base} ${VARIANTS[variant]} ${className}`} {...props} />;
}
