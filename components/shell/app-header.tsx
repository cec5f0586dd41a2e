"use client";
// The bar on every signed-in screen: where you are, who you are (a link to My account), theme, sign-out.
import Link from "next/link";
import { usePathname } from "next/navigation";
import { SignOutButton } from "@/components/sync/sign-out-button";
import { SyncIndicator } from "@/components/sync/sync-indicator";
import { WithdrawnBanner } from "@/components/sync/withdrawn-banner";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import { ThemeToggle } from "./theme-toggle";
import { useMe } from "./use-me";

const NAV: { href: string; label: string; roles?: string[] }[] = [
  { href: "/", label: "Room" },
  { href: "/procedures", label: "Procedures" },
  { href: "/calc", label: "Calculators" },
  { href: "/transfers/new", label: "Transfer", roles: ["technician", "researcher", "safety_officer"] },
  { href: "/quench/new", label: "Quench" },
  { href: "/audit", label: "Audit", roles: ["safety_officer", "facility_admin"] },
  { href: "/calibrations", label: "Sensor tables", roles: ["technician", "facility_admin"] },
  { href: "/admin/users", label: "People", roles: ["facility_admin"] },
  { href: "/admin/templates", label: "Templates", roles: ["facility_admin"] },
  { href: "/admin/rules", label: "Rules", roles: ["facility_admin"] },
  { href: "/admin/mail", label: "Mail", roles: ["facility_admin"] },
  { href: "/admin/devices", label: "Tablets", roles: ["facility_admin"] },
];

export function AppHeader() {
  const { me } = useMe();
  const path = usePathname();
  return (
    <header className="no-print sticky top-0 z-20 border-b border-line bg-panel/95 backdrop-blur">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-2 px-4 py-2">
        <Link href="/" className="mr-2 flex min-h-12 items-center gap-2 text-xl font-bold tracking-tight">
          <span aria-hidden className="inline-block h-6 w-6 rounded-md bg-accent" />
          Rimelog
        </Link>
        <nav aria-label="Main" className="flex flex-wrap gap-1">
          {NAV.filter((n) => !n.roles || (me && n.roles.includes(me.role))).map((n) => {
            const active = n.href === "/" ? path === "/" : path.startsWith(n.href);
            return (
              <Link
                key={n.href}
                href={n.href}
                aria-current={active ? "page" : undefined}
                className={`flex min-h-12 items-center rounded-xl px-4 font-semibold ${active ? "bg-sunk text-ink" : "text-muted hover:bg-sunk"}`}
              >
                {n.label}
              </Link>
            );
          })}
        </nav>
        <div className="ml-auto flex flex-wrap items-center gap-2">
          <SyncIndicator />
          {me && (
            <Link
              href="/account"
              title="My account"
              aria-current={path === "/account" ? "page" : undefined}
              className="flex min-h-12 flex-col justify-center rounded-xl px-2 text-right leading-tight hover:bg-sunk"
            >
              <span className="block font-semibold">{me.name}</span>
              <span className="block text-sm text-muted">{ROLE_LABEL[me.role]} · My account</span>
            </Link>
          )}
          <ThemeToggle />
          <SignOutButton userId={me?.id} />
        </div>
      </div>
      <WithdrawnBanner />
    </header>
  );
}
