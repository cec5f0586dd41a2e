// Buttons sized for gloved hands: at least 48 px tall, clear labels, one primary per screen.
import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-accent text-accent-ink hover:brightness-110 border-transparent",
  secondary: "bg-panel text-ink border-line hover:bg-sunk",
  danger: "bg-danger text-danger-ink border-transparent hover:brightness-110",
  ghost: "bg-transparent text-ink border-transparent hover:bg-sunk",
};

export function buttonClass(variant: Variant = "secondary", extra = ""): string {
  return `inline-flex min-h-12 min-w-12 items-center justify-center gap-2 rounded-xl border-2 px-5 py-2 text-base font-semibold disabled:cursor-not-allowed disabled:opacity-50 ${VARIANTS[variant]} ${extra}`;
}

export function Button({
  variant = "secondary",
  className = "",
  type = "button",
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type={type} className={buttonClass(variant, className)} {...rest} />;
}
