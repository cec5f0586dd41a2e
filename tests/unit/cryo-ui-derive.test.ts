// The live derived values of the reading forms (components/cryo/derive.ts). Each check names the
// outside source of its expected figure.
import { describe, expect, it } from "vitest";
import {
  type CryostatLike,
  type Derived,
  deriveReading,
  durationText,
  readNumber,
  sinceLastFill,
} from "@/components/cryo/derive";
import { PLOVER as PLOVER_CONFIG } from "@/db/seed";
import { parseCalibration } from "@/lib/cryo";

// The demo lab's Plover (db/seed.ts): table calibration near the neck, 0.12 T/A, VTI by vapour pressure.
const PLOVER: CryostatLike = { id: "plover", config: PLOVER_CONFIG };

const HERON: CryostatLike = {
  id: "heron",
  config: {
    stages: [{ key: "mxc", label: "Mixing chamber", nominalK: 0.012 }],
    magnet: {
      coilConstantTPerA: 0.09,
      maxCurrentA: 100,
      inductanceH: 20,
      rampLimitTPerMin: 0.15,
      persistentSwitch: true,
    },
  },
};

function items(d: Derived) {
  if (d.status !== "ok") throw new Error(`expected figures, got ${JSON.stringify(d)}`);
  return d.items;
}

describe("vapour pressure → ITS-90 4He temperature", () => {
  it("1013.25 mbar on the VTI is the normal boiling point 4.2221 K (ITS-90, Metrologia 27, 3 (1990))", () => {
    const [t] = items(
      deriveReading({ cryostat: PLOVER, quantity: "VTI pressure", unit: "mbar", value: "1013.25", stage: "vti" }),
    );
    expect(t?.value).toBeCloseTo(4.2221, 4);
    expect(t?.text).toBe("4.222 K");
  });

  it("100 mbar → 2.488559 K; 10 000 Pa gives the same (ITS-90 eq. (3), Table 3 coefficients [calc])", () => {
    const mbar = items(deriveReading({ cryostat: PLOVER, quantity: "1 K pot pressure", unit: "mbar", value: 100 }));
    const pa = items(deriveReading({ cryostat: PLOVER, quantity: "1 K pot pressure", unit: "Pa", value: 10_000 }));
    expect(mbar[0]?.value).toBeCloseTo(2.488559, 5);
    expect(pa[0]?.value).toBeCloseTo(2.488559, 5);
  });

  it("a pressure below the scale's range is a message naming the range, not NaN", () => {
    const d = deriveReading({ cryostat: PLOVER, quantity: "VTI pressure", unit: "mbar", value: 0.01, stage: "vti" });
    expect(d.status).toBe("error");
    if (d.status === "error") expect(d.message).toMatch(/below the ITS-90 range/);
  });

  it("a mixture tank pressure is not read as a vapour pressure", () => {
    expect(deriveReading({ cryostat: HERON, quantity: "Mixture tank pressure", unit: "mbar", value: 806 }).status).toBe(
      "none",
    );
  });
});

describe("still pressure: no vapour-pressure temperature", () => {
  // The still's vapour is ³He evaporating from a dilute ³He/⁴He mixture: neither ITS-90 helium scale
  // (Metrologia 27, 3 (1990): saturated vapour over pure ⁴He or pure ³He) gives its temperature.
  const vapourItems = (d: Derived) =>
    d.status === "ok" ? d.items.filter((i) => /vapour pressure/i.test(i.label)) : [];

  it("0.08 mbar on Heron's still gives no figure and no scale error, only a labelled note", () => {
    for (const input of [
      { cryostat: HERON, quantity: "Still pressure", unit: "mbar", value: "0.08" },
      { cryostat: HERON, quantity: "Pressure", unit: "mbar", value: "0.08", stage: "still" },
    ]) {
      const d = deriveReading(input);
      expect(d.status).toBe("ok");
      expect(vapourItems(d)).toEqual([]);
      if (d.status === "ok") {
        expect(d.items).toEqual([]);
        expect(d.note).toMatch(/³He.*dilute.*mixture/);
      }
    }
  });

  it("even when the cryostat names the still as its vapour-pressure stage", () => {
    const odd: CryostatLike = { id: "odd", config: { ...HERON.config, vapourPressureStage: "still" } };
    const d = deriveReading({ cryostat: odd, quantity: "Pressure", unit: "mbar", value: 0.08, stage: "still" });
    expect(d.status).toBe("ok"); // not the ⁴He scale's range error
    expect(vapourItems(d)).toEqual([]);
    // a still pressure high enough to lie inside the ⁴He scale still gets no ⁴He temperature
    expect(vapourItems(deriveReading({ cryostat: odd, quantity: "Still pressure", unit: "mbar", value: 20 }))).toEqual(
      [],
    );
  });

  it("a pure ³He pot keeps its thermometry, on the ³He scale: 1160.1 Pa → 1.000 K (lib/cryo/README.md [calc])", () => {
    const [t] = items(deriveReading({ cryostat: HERON, quantity: "³He pot pressure", unit: "mbar", value: 11.601 }));
    expect(t?.label).toBe("Temperature (ITS-90, ³He vapour pressure)");
    expect(t?.value).toBeCloseTo(1.0, 3);
  });
});

describe("helium level → litres and days left", () => {
  it("50 % on Plover is 48.5 L by the reservoir's table (linear between 10 % = 8.5 L and 90 % = 88.5 L, hand arithmetic)", () => {
    const [litres] = items(deriveReading({ cryostat: PLOVER, quantity: "Helium level", unit: "%", value: 50 }));
    expect(litres?.value).toBeCloseTo(48.5, 10);
  });

  it("a steady 5 L/day loss from 63.5 L reaches the 25 % minimum (23.5 L) in 8 days (hand arithmetic: 40 L / 5 L/day)", () => {
    const day = 86_400_000;
    const t0 = Date.parse("2026-11-01T08:00:00Z");
    const history = [80, 75, 70].map((percent, i) => ({ timeMs: t0 + i * day, percent }));
    const d = deriveReading({
      cryostat: PLOVER,
      quantity: "Helium level",
      unit: "%",
      value: 65,
      levelHistory: history,
      nowMs: t0 + 3 * day,
    });
    const [litres, rate, days] = items(d);
    expect(litres?.value).toBeCloseTo(63.5, 10);
    expect(rate?.value).toBeCloseTo(5, 10);
    expect(days?.value).toBeCloseTo(8, 8);
  });

  it("a level above 100 % is refused with the table's range", () => {
    const d = deriveReading({ cryostat: PLOVER, quantity: "Helium level", unit: "%", value: 120 });
    expect(d).toMatchObject({ status: "error" });
  });

  it("sinceLastFill keeps only the readings after the newest fill", () => {
    const pts = [60, 55, 50, 90, 85, 80].map((percent, i) => ({ timeMs: i, percent }));
    expect(sinceLastFill(pts).map((p) => p.percent)).toEqual([90, 85, 80]);
  });
});

describe("magnet current → field and ramp time", () => {
  it("22.2 A on Heron (0.09 T/A) is 1.998 T, 13.32 min from 0 T at 0.15 T/min (hand arithmetic B = k·I, t = ΔB/rate)", () => {
    const d = deriveReading({ cryostat: HERON, quantity: "Magnet current", unit: "A", value: "22.2" });
    const [field, ramp] = items(d);
    expect(field?.value).toBeCloseTo(1.998, 10);
    expect(ramp?.value).toBeCloseTo(13.32, 10);
    expect(d.status === "ok" && d.caution).toBe("magnet");
  });

  it("ramp starts from the field the magnet is at", () => {
    const [, ramp] = items(
      deriveReading({ cryostat: HERON, quantity: "Magnet current", unit: "A", value: 22.2, fromFieldT: 1.5 }),
    );
    expect(ramp?.value).toBeCloseTo((1.998 - 1.5) / 0.15, 10);
  });

  it("a current above the rating is a message, not a figure", () => {
    const d = deriveReading({ cryostat: HERON, quantity: "Magnet current", unit: "A", value: 150 });
    expect(d.status).toBe("error");
    if (d.status === "error") expect(d.message).toMatch(/magnet's rating/);
  });

  it("a field in mT gives the current (3 T on Plover at 0.12 T/A = 25 A)", () => {
    const [current] = items(deriveReading({ cryostat: PLOVER, quantity: "Field", unit: "mT", value: 3000 }));
    expect(current?.value).toBeCloseTo(25, 10);
  });

  it("a cryostat with no magnet shows nothing for a current", () => {
    const wren: CryostatLike = { id: "wren", config: { stages: [{ key: "bath", label: "Bath", nominalK: 4.2 }] } };
    expect(deriveReading({ cryostat: wren, quantity: "Heater current", unit: "A", value: 1 }).status).toBe("none");
  });
});

describe("sensor resistance → temperature", () => {
  const table = parseCalibration("T R\n0.01 20000\n0.1 5000\n1 2000\n4.2 1200\n", { sensorKind: "ruthenium-oxide" });

  it("a reading at a table node returns the node's temperature (interpolant passes through the data)", () => {
    const [t] = items(
      deriveReading({
        cryostat: HERON,
        quantity: "Resistance",
        unit: "Ω",
        value: 5000,
        stage: "mxc",
        calibration: table,
      }),
    );
    expect(t?.value).toBeCloseTo(0.1, 10);
    expect(t?.text).toBe("100 mK");
  });

  it("a reading in kΩ is converted before the look-up", () => {
    const [t] = items(
      deriveReading({
        cryostat: HERON,
        quantity: "Resistance",
        unit: "kΩ",
        value: 2,
        stage: "mxc",
        calibration: table,
      }),
    );
    expect(t?.value).toBeCloseTo(1, 10);
  });

  it("outside the table it is a message, not an extrapolation", () => {
    const d = deriveReading({
      cryostat: HERON,
      quantity: "Resistance",
      unit: "Ω",
      value: 50_000,
      stage: "mxc",
      calibration: table,
    });
    expect(d).toMatchObject({ status: "error" });
  });

  it("a Pt100 at 138.51 Ω is 100 °C (IEC 60751 table value)", () => {
    const [t] = items(
      deriveReading({ cryostat: HERON, quantity: "Pt100 on the gas handling", unit: "Ω", value: 138.51 }),
    );
    expect(t?.value).toBeCloseTo(373.15, 1);
  });

  it("without a table or a platinum name there is nothing to show", () => {
    expect(
      deriveReading({ cryostat: HERON, quantity: "Resistance", unit: "Ω", value: 5000, stage: "mxc" }).status,
    ).toBe("none");
  });
});

describe("input handling", () => {
  it("empty or half-typed values show nothing; a comma decimal is read", () => {
    expect(readNumber("")).toBeUndefined();
    expect(readNumber("1e")).toBeUndefined();
    expect(readNumber("-")).toBeUndefined();
    expect(readNumber("4,2")).toBe(4.2);
    expect(deriveReading({ cryostat: HERON, quantity: "Magnet current", unit: "A", value: "" }).status).toBe("none");
  });

  it("durations read as a person would say them", () => {
    expect(durationText(13.32)).toBe("13.3 min");
    expect(durationText(185)).toBe("3 h 05 min");
  });
});
