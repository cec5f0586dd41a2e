// Cautions: every screen's texts carry the facility's own values and end by deferring to the
// facility's rules, training, the safety officer and the maker's instructions; computed figures
// read as estimates. Values are the demo lab's (db/seed.ts DEMO_RULES).

import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { DEMO_RULES } from "@/db/seed";
import { CAUTION_TOPIC_NAMES, cautionsFor, deferral, facilityFacts } from "@/lib/safety/cautions";
import {
  ESTIMATE_NOTE,
  fringeDistanceText,
  heliumLostText,
  oxygenEstimateText,
  storedEnergyText,
} from "@/lib/safety/estimates";
import { checkRulesDocument, isPdf, RULES_DOCUMENT_MAX_BYTES } from "@/lib/safety/rules-document";

describe("cautions", () => {
  it.each(CAUTION_TOPIC_NAMES)(
    "%s: every section ends by deferring to rules, training, the safety officer and the maker",
    (topic) => {
      const sections = cautionsFor(topic, DEMO_RULES, { cryostatId: "plover", cryostatName: "Plover" });
      expect(sections.length).toBeGreaterThan(0);
      for (const s of sections) {
        expect(s.points.length).toBeGreaterThan(0);
        expect(s.deferral).toMatch(/facility's own rules/);
        expect(s.deferral).toMatch(/training/);
        expect(s.deferral).toMatch(/safety officer/);
        expect(s.deferral).toMatch(/equipment maker's instructions/);
        expect(s.deferral).toContain("Dr. Grace Oyelaran");
      }
    },
  );

  it("the transfer caution names the facility's PPE, alarm level and two-person rule", () => {
    const all = cautionsFor("transfer", DEMO_RULES)
      .flatMap((s) => s.points)
      .join(" ");
    expect(all).toContain("Face shield, Cryogenic gloves");
    expect(all).toContain("19.5 %");
    expect(all).toContain("18 %");
    expect(all).toMatch(/two people present/);
    expect(all).toMatch(/Never seal a cryogen vessel/);
    expect(all).toMatch(/relief valves/i);
  });

  it("follows the facility's values when they change", () => {
    const other = { ...DEMO_RULES, oxygenAlarmPercent: 20, twoPersonTransfer: false, ppe: ["Visor"] };
    const all = cautionsFor("transfer", other)
      .flatMap((s) => s.points)
      .join(" ");
    expect(all).toContain("20 %");
    expect(all).not.toMatch(/require two people/);
    expect(all).toContain("Visor");
  });

  it("the ramp caution gives the cryostat's own limit and the maker's", () => {
    const ramp = cautionsFor("ramp", DEMO_RULES, {
      cryostatId: "heron",
      cryostatName: "Heron",
      makerRampLimitTPerMin: 0.15,
    });
    const text = ramp.flatMap((s) => s.points).join(" ");
    expect(text).toContain("facility's limit for Heron is 0.15 T/min");
    expect(text).toMatch(/pacemakers/);
    expect(text).toContain("0.5 mT");
    expect(text).toMatch(/persistent-switch heater/);
    expect(text).toMatch(/estimate/);
  });

  it("facts list the two-person rule, PPE and contacts", () => {
    const f = facilityFacts(DEMO_RULES, { cryostatId: "plover" });
    expect(f.minLevel).toBe(25);
    expect(f.maxRamp).toBe(0.2);
    expect(f.contacts).toHaveLength(3);
    expect(deferral({ ...DEMO_RULES, contacts: [] })).toMatch(/the safety officer/);
  });
});

describe("computed figures are labelled estimates", () => {
  it.each([
    ["oxygen", oxygenEstimateText(0.19, DEMO_RULES, "30 m³ into 220 m³")],
    ["fringe", fringeDistanceText(2.154, 1.71, 0.5)],
    ["helium", heliumLostText(19.5, "upper bound")],
    ["energy", storedEnergyText(50_000)],
  ])("%s", (_name, text) => {
    expect(text.startsWith("Estimate:")).toBe(true);
    expect(text).toContain(ESTIMATE_NOTE);
  });
  it("an oxygen estimate below the alarm level says so", () => {
    expect(oxygenEstimateText(0.19, DEMO_RULES, "x")).toMatch(/below the facility's alarm level of 19.5 %/);
    expect(oxygenEstimateText(0.205, DEMO_RULES, "x")).not.toMatch(/below/);
  });
});

describe("rules document check", () => {
  it("accepts a real PDF (made with pdf-lib)", async () => {
    const doc = await PDFDocument.create();
    doc.addPage();
    const bytes = await doc.save();
    expect(isPdf(bytes)).toBe(true);
    expect(checkRulesDocument(bytes, "rules.pdf")).toEqual({ ok: true });
  });
  it("refuses a PNG named .pdf, saying it is not a PDF", () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0]);
    const r = checkRulesDocument(png, "rules.pdf");
    expect(r).toMatchObject({ ok: false, status: 415 });
    if (!r.ok) expect(r.message).toMatch(/"rules.pdf" is not a PDF/);
  });
  it("refuses a file over the limit with its size and the limit", () => {
    const big = new Uint8Array(RULES_DOCUMENT_MAX_BYTES + 1);
    big.set([0x25, 0x50, 0x44, 0x46, 0x2d]);
    const r = checkRulesDocument(big, "huge.pdf");
    expect(r).toMatchObject({ ok: false, status: 413 });
    if (!r.ok) expect(r.message).toMatch(/the limit is 10 MB/);
    expect(checkRulesDocument(big.subarray(0, RULES_DOCUMENT_MAX_BYTES), "ok.pdf").ok).toBe(true);
  });
  it("refuses an empty file", () => {
    expect(checkRulesDocument(new Uint8Array(0), "e.pdf")).toMatchObject({ ok: false, status: 400 });
  });
});
