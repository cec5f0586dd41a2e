// Surfaces and small status primitives shared by every screen.
import type { HTMLAttributes, ReactNode } from "react";

export function Panel({ className = "", ...rest }: HTMLAttributes<HTMLElement>) {
  return <section className={`rounded-2xl border border-line bg-panel p-5 shadow-sm ${className}`} {...rest} />;
}

type Tone = "neutral" | "ok" | "warn" | "danger" | "accent";
const TONES: Record<Tone, string> = {
  neutral: "border-line text-muted",
  ok: "border-ok text-ok",
  warn: "border-warn text-warn",
  danger: "border-danger text-danger",
  accent: "border-accent text-accent",
};

export function Tag({ tone = "neutral", children }: { tone?: Tone; children: ReactNode }) {
  return (
    <span
      className={`inline-flex items-center rounded-full border-2 px-3 py-0.5 text-base font-semibold ${TONES[tone]}`}
    >
      {children}
    </span>
  );
}

export function Notice({
  tone = "neutral",
  title,
  children,
  role,
}: {
  tone?: Tone;
  title?: string;
  children?: ReactNode;
  role?: "alert" | "status";
}) {
  return (
    <div role={role} className={`rounded-xl border-2 bg-panel px-4 py-3 ${TONES[tone]}`}>
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className="text-ink">{children}</div>}
    </div>
  );
}

export function Loading({ label = "Loading…" }: { label?: string }) {
  return (
    <p role="status" className="animate-pulse py-8 text-center text-muted">
      {label}
    </p>
  );
}
