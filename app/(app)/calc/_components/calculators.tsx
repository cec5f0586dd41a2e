"use client";
// The /calc page: one cached page, sections picked client-side by the URL hash (#magnet, …),
// so every calculator works offline once the page is in the service worker's cache.
import { type ReactNode, useEffect, useState } from "react";
import { HeliumSection, MagnetSection } from "./helium-magnet";
import { GasSection, OxygenSection } from "./safety-gas";
import { CalibrationSection, Its90Section, PlatinumSection } from "./thermometry";
import { TransportSection } from "./transport";

const SECTIONS: { id: string; label: string; title: string; render: () => ReactNode }[] = [
  { id: "its90", label: "ITS-90", title: "Helium vapour-pressure thermometry", render: () => <Its90Section /> },
  { id: "platinum", label: "Platinum", title: "Platinum resistance thermometers", render: () => <PlatinumSection /> },
  { id: "calibration", label: "Sensor table", title: "Sensor calibration table", render: () => <CalibrationSection /> },
  { id: "helium", label: "Helium", title: "Liquid helium", render: () => <HeliumSection /> },
  { id: "magnet", label: "Magnet", title: "Superconducting magnet", render: () => <MagnetSection /> },
  { id: "oxygen", label: "Oxygen", title: "Oxygen deficiency", render: () => <OxygenSection /> },
  { id: "gas", label: "Gas", title: "Gas accounting", render: () => <GasSection /> },
  { id: "transport", label: "Transport", title: "Transport and Kondo", render: () => <TransportSection /> },
];

function fromHash(): string {
  const h = typeof window === "undefined" ? "" : window.location.hash.slice(1);
  return SECTIONS.some((s) => s.id === h) ? h : "its90";
}

export function Calculators() {
  const [active, setActive] = useState<string | null>(null);
  useEffect(() => {
    setActive(fromHash());
    const onHash = () => setActive(fromHash());
    window.addEventListener("hashchange", onHash);
    return () => window.removeEventListener("hashchange", onHash);
  }, []);
  const current = SECTIONS.find((s) => s.id === active);
  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1 className="text-3xl font-bold">Calculators</h1>
        <p className="text-muted">
          Work on this tablet with no network. Figures outside a formula&apos;s range are refused, never stretched.
        </p>
      </div>
      <nav
        aria-label="Calculator sections"
        className="sticky top-[64px] z-10 -mx-1 flex flex-wrap gap-1 bg-bg/95 px-1 py-1 backdrop-blur"
      >
        {SECTIONS.map((s) => (
          <a
            key={s.id}
            href={`#${s.id}`}
            aria-current={s.id === active ? "page" : undefined}
            className={`flex min-h-12 items-center rounded-xl border-2 px-4 font-semibold ${
              s.id === active
                ? "border-accent bg-accent text-accent-ink"
                : "border-line bg-panel text-ink hover:bg-sunk"
            }`}
          >
            {s.label}
          </a>
        ))}
      </nav>
      {current ? (
        <section id={`section-${current.id}`} aria-labelledby={`h-${current.id}`} className="flex flex-col gap-3">
          <h2 id={`h-${current.id}`} className="text-2xl font-bold">
            {current.title}
          </h2>
          <div className="grid items-start gap-4 lg:grid-cols-2">{current.render()}</div>
        </section>
      ) : (
        <p role="status" className="py-8 text-center text-muted">
          Loading calculators…
        </p>
      )}
    </div>
  );
}
