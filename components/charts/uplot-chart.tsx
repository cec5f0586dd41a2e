"use client";
// A thin React wrapper over uPlot: builds the chart after mount (uPlot needs the DOM), follows
// the container's width, and rebuilds when the theme changes so the canvas colours (read from CSS
// variables, see charts.css) match light and dim. Options come from a function of the palette.
import { useEffect, useRef } from "react";
import type uPlotType from "uplot";
import "uplot/dist/uPlot.min.css";
import "./charts.css";

export interface Palette {
  series: string[];
  grid: string;
  axis: string;
  ink: string;
  muted: string;
  danger: string;
  band: string;
  fill: string;
  font: string;
}

function readPalette(el: HTMLElement): Palette {
  const css = getComputedStyle(el);
  const v = (name: string, fallback: string) => css.getPropertyValue(name).trim() || fallback;
  return {
    series: [1, 2, 3, 4, 5, 6].map((i) => v(`--chart-${i}`, "#0b5cad")),
    grid: v("--chart-grid", "rgba(0,0,0,0.1)"),
    axis: v("--chart-axis", "#4a5a6e"),
    ink: v("--c-ink", "#0f1b2a"),
    muted: v("--c-muted", "#4a5a6e"),
    danger: v("--c-danger", "#b3261e"),
    band: v("--chart-band", "rgba(0,0,0,0.06)"),
    fill: v("--chart-fill", "rgba(0,0,0,0.06)"),
    font: `13px ${css.fontFamily || "sans-serif"}`,
  };
}

export interface UplotChartProps {
  /** Options without width (the chart fills its container). */
  options: (palette: Palette, uPlot: typeof uPlotType) => Omit<uPlotType.Options, "width">;
  data: uPlotType.AlignedData;
  /** Accessible name: what the chart shows. */
  label: string;
  className?: string;
}

export function UplotChart({ options, data, label, className = "" }: UplotChartProps) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    let chart: uPlotType | null = null;
    let cancelled = false;
    let lib: typeof uPlotType | null = null;
    const build = () => {
      if (!lib || cancelled) return;
      chart?.destroy();
      const opts = options(readPalette(el), lib);
      chart = new lib({ ...opts, width: Math.max(280, el.clientWidth) }, data, el);
    };
    // uPlot touches window at import time: load it in the browser only.
    void import("uplot").then((m) => {
      lib = m.default;
      build();
    });
    const resize = new ResizeObserver(() => {
      if (chart) chart.setSize({ width: Math.max(280, el.clientWidth), height: chart.height });
    });
    resize.observe(el);
    const theme = new MutationObserver(build);
    theme.observe(document.documentElement, { attributes: true, attributeFilter: ["data-theme"] });
    return () => {
      cancelled = true;
      resize.disconnect();
      theme.disconnect();
      chart?.destroy();
    };
  }, [options, data]);
  return <div ref={box} role="figure" aria-label={label} className={`rl-chart min-h-[200px] w-full ${className}`} />;
}
