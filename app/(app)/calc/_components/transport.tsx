"use client";
import { Calculator, parsePairs } from "@/components/cryo/calc-kit";
import { figure } from "@/components/cryo/derive";
import { Panel } from "@/components/ui/panel";
// Mesoscopic transport: conductance and flux quanta, Aharonov–Bohm ring period and flux count,
// the empirical Kondo G(T), a T_K fit to pasted (T, G) data with standard errors, the Kondo cloud.
import {
  aharonovBohmPeriodT,
  CONDUCTANCE_QUANTUM_S,
  conductanceInQuanta,
  FLUX_QUANTUM_H_OVER_2E_WB,
  FLUX_QUANTUM_H_OVER_E_WB,
  fitKondo,
  fluxQuantaThroughRing,
  kondoCloudLengthM,
  kondoConductance,
} from "@/lib/cryo";

const EXAMPLE_G = `# T (K)  G (2e²/h) — example data
0.02  0.7875
0.04  0.7402
0.07  0.6735
0.1   0.6039
0.15  0.5314
0.2   0.4737
0.3   0.3980
0.45  0.3394
0.6   0.2960
0.8   0.2639
1.0   0.2346`;

const BACKGROUND_OPTIONS = [
  { value: "no", label: "None" },
  { value: "yes", label: "Fit a constant background" },
];

const lengthText = (m: number) =>
  m >= 1e-3 ? `${figure(m * 1000, 3)} mm` : m >= 1e-6 ? `${figure(m * 1e6, 3)} µm` : `${figure(m * 1e9, 3)} nm`;

export function TransportSection() {
  return (
    <>
      <Panel className="flex flex-col gap-2">
        <h3 className="text-lg font-bold">Constants (2019 SI, exact e and h)</h3>
        <dl className="num grid gap-1 text-base">
          <div className="flex justify-between gap-4">
            <dt>Conductance quantum 2e²/h</dt>
            <dd>{CONDUCTANCE_QUANTUM_S.toExponential(11)} S</dd>
          </div>
          <div className="flex justify-between gap-4">
            <dt>… as a resistance h/2e²</dt>
            <dd>{figure(1 / CONDUCTANCE_QUANTUM_S, 8)} Ω</dd>
          </div>
          <div className="flex justify-between gap-4">
            <dt>Flux quantum h/e</dt>
            <dd>{FLUX_QUANTUM_H_OVER_E_WB.toExponential(9)} Wb</dd>
          </div>
          <div className="flex justify-between gap-4">
            <dt>Superconducting flux quantum h/2e</dt>
            <dd>{FLUX_QUANTUM_H_OVER_2E_WB.toExponential(9)} Wb</dd>
          </div>
        </dl>
      </Panel>
      <Calculator
        title="Conductance in quanta"
        fields={[{ key: "g", label: "Conductance", unit: "µS", initial: "38.74", match: /Conductance/ }]}
        compute={({ n }) => [
          { label: "G / (2e²/h)", text: figure(conductanceInQuanta(n.g! * 1e-6), 5) },
          { label: "Resistance", text: `${figure(1 / (n.g! * 1e-6), 5)} Ω` },
        ]}
      />
      <Calculator
        title="Aharonov–Bohm ring"
        fields={[
          { key: "d", label: "Mean diameter", unit: "µm", initial: "0.8", match: /diameter/ },
          { key: "b", label: "Field", unit: "mT", initial: "100", match: /^Field/ },
        ]}
        compute={({ n }) => {
          const ring = { meanDiameterM: n.d! * 1e-6 };
          return [
            { label: "Period ΔB = (h/e)/A", text: `${figure(aharonovBohmPeriodT(ring) * 1000, 4)} mT` },
            {
              label: `Flux quanta h/e at ${figure(n.b!)} mT`,
              text: figure(fluxQuantaThroughRing(n.b! / 1000, ring), 4),
            },
          ];
        }}
      />
      <Calculator
        title="Kondo conductance G(T)"
        intro="Empirical form G(T) = G₀·[1 + (2^{1/s} − 1)(T/T_K)²]^(−s), s ≈ 0.22; G(T_K) = G₀/2."
        fields={[
          { key: "tk", label: "Kondo temperature T_K", unit: "K", initial: "0.3", match: /Kondo temperature/ },
          { key: "g0", label: "G₀ (any unit)", initial: "0.8", match: /G\(0\)/ },
          { key: "s", label: "s", initial: "0.22", match: /^s /, hint: "0.22 for spin-½ (empirical)" },
          { key: "t", label: "Temperature", unit: "K", initial: "0.1", match: /^Temperature/ },
        ]}
        compute={({ n }) => [
          {
            label: `G(${figure(n.t!)} K)`,
            text: figure(kondoConductance(n.t!, { kondoTemperatureK: n.tk!, conductanceAtZeroK: n.g0!, s: n.s! }), 5),
          },
        ]}
      />
      <Calculator
        title="Fit T_K to measured G(T)"
        wide
        intro="Paste temperature (K) and conductance (any unit, e.g. 2e²/h). Least squares with s fixed; standard errors from the fit."
        fields={[
          {
            kind: "text",
            key: "data",
            label: "Data (T, G)",
            initial: EXAMPLE_G,
            rows: 8,
            match: /Data|Kondo fit needs|^Temperature|^Conductance/,
          },
          { key: "s", label: "s", initial: "0.22", match: /^s / },
          { kind: "select", key: "bg", label: "Background", initial: "no", options: BACKGROUND_OPTIONS },
        ]}
        compute={({ n, s }) => {
          const points = parsePairs(s.data ?? "", "Data").map(([temperatureK, conductance]) => ({
            temperatureK,
            conductance,
          }));
          const fit = fitKondo(points, { s: n.s!, background: s.bg === "yes" });
          const rows = [
            {
              label: "T_K",
              text: `${figure(fit.kondoTemperatureK * 1000, 4)} ± ${figure(fit.kondoTemperatureStandardErrorK * 1000, 2)} mK`,
            },
            {
              label: "G₀",
              text: `${figure(fit.conductanceAtZeroK, 4)} ± ${figure(fit.conductanceAtZeroKStandardError, 2)}`,
            },
            ...(fit.background !== undefined
              ? [
                  {
                    label: "Background",
                    text: `${figure(fit.background, 3)} ± ${figure(fit.backgroundStandardError ?? NaN, 2)}`,
                  },
                ]
              : []),
            { label: "Residual (rms)", text: figure(fit.residualRms, 3) },
            {
              label: "Points",
              text: `${points.length}${fit.converged ? "" : " — fit did not converge"}`,
              tone: fit.converged ? undefined : ("warn" as const),
            },
          ];
          return rows;
        }}
      />
      <Calculator
        title="Kondo cloud length"
        intro="ξ_K = ħ·v_F/(k_B·T_K)."
        fields={[
          { key: "vf", label: "Fermi velocity", unit: "m/s", initial: "2e5", match: /Fermi/ },
          { key: "tk", label: "T_K", unit: "K", initial: "0.3", match: /Kondo temperature/ },
        ]}
        compute={({ n }) => [{ label: "ξ_K", text: lengthText(kondoCloudLengthM(n.vf!, n.tk!)) }]}
      />
    </>
  );
}
