// Cryogen and magnet cautions in plain words, filled in with the facility's own values. Pure: the
// screens (components/safety), the PDF report and the tests all read the same texts. Every caution
// ends by deferring to the facility's rules, training, the safety officer and the equipment
// maker's instructions; the app is a reminder, never the authority.
import type { FacilityRulesValues } from "@/lib/schemas/rules";

/** The hazards Rimelog writes about. */
export const CAUTION_SECTIONS = [
  "cold",
  "oxygen",
  "pressure",
  "transfer-line",
  "magnet-field",
  "ramp",
  "persistent-switch",
  "quench",
] as const;
export type CautionSectionId = (typeof CAUTION_SECTIONS)[number];

/** The screens (places where the work happens) and the hazards each one shows. */
export const CAUTION_TOPICS = {
  transfer: ["cold", "oxygen", "pressure", "transfer-line"],
  cooldown: ["cold", "oxygen", "pressure"],
  warmup: ["pressure", "oxygen"],
  ramp: ["magnet-field", "ramp", "persistent-switch", "quench"],
  quench: ["quench", "oxygen", "magnet-field", "pressure"],
  magnet: ["magnet-field", "ramp", "persistent-switch", "quench"],
  oxygen: ["oxygen"],
  cold: ["cold"],
} as const satisfies Record<string, readonly CautionSectionId[]>;
export type CautionTopic = keyof typeof CAUTION_TOPICS;
export const CAUTION_TOPIC_NAMES = Object.keys(CAUTION_TOPICS) as CautionTopic[];

export type CautionSection = {
  id: CautionSectionId;
  title: string;
  points: string[];
  /** The closing sentence: always defers to the facility's rules, training, officer and maker. */
  deferral: string;
};

export type CautionContext = {
  /** The cryostat the screen is about, for its own ramp limit and minimum level. */
  cryostatId?: string;
  cryostatName?: string;
  /** Magnet's ramp limit from the maker (T/min), when the cryostat has a magnet. */
  makerRampLimitTPerMin?: number;
};

const pct = (x: number) => `${Number(x.toFixed(2))} %`;

/** Who to ask: the first contact whose role mentions safety, else the first contact. */
export function safetyContact(rules: FacilityRulesValues): string {
  const c = rules.contacts.find((x) => /safety/i.test(x.role)) ?? rules.contacts[0];
  return c ? `${c.name} (${c.role}, ${c.phone})` : "the safety officer";
}

/** The deferral every caution ends with. */
export function deferral(rules: FacilityRulesValues): string {
  return (
    `This is a reminder, not a procedure. The facility's own rules (${rules.facilityName}), your training, ` +
    `the safety officer — ${safetyContact(rules)} — and the equipment maker's instructions come first; ` +
    `where they say something different, follow them.`
  );
}

function ppeText(rules: FacilityRulesValues): string {
  return rules.ppe.length
    ? rules.ppe.join(", ")
    : "the protective equipment your facility requires (none is listed in Rimelog yet)";
}

function sectionPoints(
  id: CautionSectionId,
  rules: FacilityRulesValues,
  ctx: CautionContext,
): { title: string; points: string[] } {
  const alarm = pct(rules.oxygenAlarmPercent);
  const evacuate = pct(rules.oxygenEvacuatePercent);
  const field = `${Number(rules.controlledAreaMilliTesla.toFixed(3))} mT`;
  switch (id) {
    case "cold":
      return {
        title: "Cold burns: wear the protective equipment",
        points: [
          `Liquid helium and liquid nitrogen, and anything they have cooled, freeze skin on contact. Wear: ${ppeText(rules)}.`,
          "Never touch cold metal, hoses or the transfer line with bare hands; loose gloves that can be thrown off are safer than tight ones if liquid gets inside.",
          "If skin is burned by cold, do not rub it; warm it gently with lukewarm water and get first aid.",
        ],
      };
    case "oxygen":
      return {
        title: "Oxygen deficiency: helium and nitrogen gas push out the air",
        points: [
          `Check the oxygen monitor before you start and watch it while you work. The facility's alarm level is ${alarm}; at ${evacuate} leave the room at once and do not go back in to help someone without the emergency services.`,
          "Keep the room ventilation running; do not block extract grilles or prop doors shut.",
          rules.twoPersonTransfer
            ? "Never work alone on cryogen transfers here: the facility's rules require two people present."
            : "The facility does not require a second person for transfers, but tell someone where you are and when you expect to finish.",
          "You cannot smell or see a lack of oxygen; confusion and collapse can come without warning.",
        ],
      };
    case "pressure":
      return {
        title: "Pressure build-up and ice plugs",
        points: [
          "A cryogen that warms up expands many hundreds of times as gas. Never seal a cryogen vessel or trap liquid between two closed valves.",
          "Keep relief valves and burst discs free of ice and never block or remove them; check the neck and vent lines for ice plugs (frozen air or moisture) before and after work.",
          "If a neck or vent is blocked, keep people away and call the person responsible; do not force it open yourself.",
        ],
      };
    case "transfer-line":
      return {
        title: "Transfer-line handling",
        points: [
          "Insert and remove the transfer line slowly; a warm line pushed into liquid boils it off violently.",
          "Keep your face away from the dewar neck and the line joints while inserting, transferring and removing.",
          "Open the supply pressure only as far as needed and watch the cryostat's pressure; close the supply before removing the line.",
        ],
      };
    case "magnet-field":
      return {
        title: "Magnetic field: the controlled area",
        points: [
          `People with pacemakers, defibrillators or other active implants must stay outside the ${field} line. ${rules.controlledAreaNote}`.trim(),
          "Keep ferromagnetic objects (steel tools, gas cylinders, chairs, keys) away from a magnet at field: they can be pulled in with great force.",
          "Magnetic cards, watches and some electronics are damaged close to the magnet.",
          "Any fringe-field distance Rimelog shows is an estimate; the maker's field map and the facility's survey are what count.",
        ],
      };
    case "ramp": {
      const local = ctx.cryostatId ? rules.maxRampTPerMin[ctx.cryostatId] : undefined;
      const where = ctx.cryostatName ? ` for ${ctx.cryostatName}` : "";
      const limits: string[] = [];
      if (local !== undefined) limits.push(`the facility's limit${where} is ${local} T/min`);
      if (ctx.makerRampLimitTPerMin !== undefined)
        limits.push(`the maker's limit is ${ctx.makerRampLimitTPerMin} T/min`);
      return {
        title: "Ramp limits",
        points: [
          limits.length
            ? `Ramp no faster than the lower of the limits: ${limits.join("; ")}.`
            : "Ramp no faster than the maker's and the facility's limit for this magnet.",
          "Ramping too fast, or above the rated current, can quench the magnet.",
          "Watch the helium level (or cold-plate temperature) while ramping; stop if it falls unusually fast.",
        ],
      };
    }
    case "persistent-switch":
      return {
        title: "Persistent-switch heater",
        points: [
          "Only switch the persistent-switch heater on when the supply current matches the magnet current; a mismatch can quench the magnet.",
          "Record whether the magnet is in persistent mode: the field stays on with the supply switched off.",
        ],
      };
    case "quench":
      return {
        title: "Quench: sudden release of helium gas",
        points: [
          "A quench turns the magnet's stored energy into heat and boils off liquid helium within seconds; the gas can fill the room and lower the oxygen level.",
          `Leave the room if the oxygen monitor alarms (facility level ${alarm}) or if a cloud of cold gas appears; do not go back in until the monitors read normal.`,
          "Do not touch vent lines or the cryostat top after a quench: they can be very cold and under pressure.",
          "Any helium loss or oxygen figure Rimelog computes is an estimate; report the quench to the safety officer.",
        ],
      };
  }
}

/** The cautions for one screen, in the order they are shown. */
export function cautionsFor(
  topic: CautionTopic,
  rules: FacilityRulesValues,
  ctx: CautionContext = {},
): CautionSection[] {
  const close = deferral(rules);
  return CAUTION_TOPICS[topic].map((id) => ({ id, ...sectionPoints(id, rules, ctx), deferral: close }));
}

/** The key facility values every caution panel shows beside the texts. */
export function facilityFacts(rules: FacilityRulesValues, ctx: CautionContext = {}) {
  return {
    oxygen: `Oxygen alarm at ${pct(rules.oxygenAlarmPercent)}, leave the room at ${pct(rules.oxygenEvacuatePercent)}`,
    twoPerson: rules.twoPersonTransfer
      ? "Two people must be present for cryogen transfers"
      : "No two-person rule for transfers",
    ppe: rules.ppe,
    controlledArea: `Controlled area beyond the ${Number(rules.controlledAreaMilliTesla.toFixed(3))} mT line`,
    minLevel: ctx.cryostatId !== undefined ? rules.minHeliumPercent[ctx.cryostatId] : undefined,
    maxRamp: ctx.cryostatId !== undefined ? rules.maxRampTPerMin[ctx.cryostatId] : undefined,
    contacts: rules.contacts,
  };
}
