// The default procedure templates the demo lab starts with, written by the team in its own words
// from what the trade does, one set per cryostat kind. Each becomes version 1 of its key; the
// facility admin edits them into new versions (a run keeps the version it started from).
// Ranges are common practice for fridges of this size or the invented demo lab's own values
// (db/seed.ts); a facility replaces them with its own in the template editor.
// The helium transfer's steps name the transfer record's fields they fill (`recordField`,
// lib/schemas/template.ts): a completed run of it is one transfer record in the audit queue.

import type { TemplateStep } from "@/lib/schemas/template";
import type { CryostatKind } from "./schema";

export type TemplateDraft = {
  key: string;
  title: string;
  purpose: string;
  cryostatKinds: CryostatKind[];
  steps: TemplateStep[];
};

const DEFER = " Follow the facility's own rules, your training and the maker's instructions first.";

const cooldownDry: TemplateDraft = {
  key: "cooldown-dry-dilution",
  title: "Cooldown — dry dilution refrigerator",
  purpose:
    "Take a pulse-tube pre-cooled dilution refrigerator from room temperature to base temperature with the mixture accounted for.",
  cryostatKinds: ["dry_dilution"],
  steps: [
    {
      id: "caution-pressure",
      kind: "caution",
      topic: "pressure",
      text:
        "Gas trapped in a closed line or can rises in pressure as it warms, and cold parts pull air in through any leak. Keep every relief valve and burst disc in place and unblocked while the fridge is cold." +
        DEFER,
    },
    {
      id: "probe-closed",
      kind: "check",
      secondPerson: false,
      text: "Probe or sample stage mounted, wiring checked at room temperature, radiation shields and vacuum can closed with every screw in place.",
    },
    {
      id: "ovc-pressure",
      kind: "reading",
      quantity: "Vacuum can pressure before the leak check",
      unit: "mbar",
      max: 0.0001,
      ifOutOfRange:
        "Keep pumping and look for a leak at the last seal that was opened. Do not start the pulse tube on a soft vacuum.",
      text: "Read the vacuum-can gauge with the turbo pump running.",
    },
    {
      id: "leak-check",
      kind: "check",
      secondPerson: false,
      text: "Helium leak check of the vacuum can and the mixture circuit done: no leak above the facility's limit on any seal that was opened.",
    },
    {
      id: "tank-before",
      kind: "reading",
      quantity: "Mixture tank pressure before condensing",
      unit: "mbar",
      min: 700,
      max: 900,
      ifOutOfRange:
        "Do not condense. A low tank means mixture may be missing or still in the fridge: compare with the pressure written at the last warmup and tell the facility admin.",
      text: "Read the mixture tank gauge at room temperature.",
    },
    {
      id: "cold-trap",
      kind: "check",
      secondPerson: false,
      text: "Cold trap on the circulation line clean and in line (filled with liquid nitrogen if the fridge uses an external trap).",
    },
    {
      id: "compressor",
      kind: "check",
      secondPerson: false,
      text: "Cooling water to the pulse-tube compressor on, flow and inlet temperature within the compressor's limits; compressor started.",
    },
    {
      id: "precool-pt1",
      kind: "reading",
      quantity: "50 K plate temperature after pre-cool",
      unit: "K",
      max: 60,
      ifOutOfRange:
        "Pre-cool is not finished or a heat load is wrong. Wait and read again; if it stays high, check the vacuum-can pressure.",
      text: "Usually a day or more after the compressor starts.",
    },
    {
      id: "precool-pt2",
      kind: "reading",
      quantity: "4 K plate temperature after pre-cool",
      unit: "K",
      max: 4.5,
      ifOutOfRange: "Do not condense yet; wait for the 4 K plate to settle.",
      text: "Read the 4 K plate thermometer.",
    },
    {
      id: "hold-precool",
      kind: "hold",
      role: "technician",
      text: "Pre-cool finished: 4 K plate below 4.5 K, vacuum can tight. Signed before the mixture is condensed.",
    },
    {
      id: "caution-condense",
      kind: "caution",
      topic: "pressure",
      text:
        "While condensing, the mixture line pressure rises. Watch the condensing gauge and slow down or stop if it nears the limit on the gas-handling panel." +
        DEFER,
    },
    {
      id: "condense-pressure",
      kind: "reading",
      quantity: "Highest condensing line pressure",
      unit: "bar",
      max: 2.5,
      ifOutOfRange:
        "Close the condensing valve, let the pressure fall and continue more slowly. Record how high it went.",
      text: "The highest pressure seen while condensing.",
    },
    {
      id: "tank-after",
      kind: "reading",
      quantity: "Mixture tank pressure after condensing",
      unit: "mbar",
      max: 50,
      ifOutOfRange: "Mixture is still in the tank: condensing is not finished, or the cold trap is blocked.",
      text: "Most of the mixture should now be in the fridge.",
    },
    {
      id: "circulation",
      kind: "check",
      secondPerson: false,
      text: "Circulation started through the still pump; still heater set to its usual power.",
    },
    {
      id: "still-pressure",
      kind: "reading",
      quantity: "Still pressure",
      unit: "mbar",
      ifOutOfRange: "",
      text: "Read the still gauge once circulation is steady. (No temperature is derived from it: the still's vapour is ³He from a dilute mixture.)",
    },
    {
      id: "flow",
      kind: "reading",
      quantity: "Circulation rate",
      unit: "µmol/s",
      min: 150,
      max: 900,
      ifOutOfRange: "Check the still heater and the cold trap; a falling rate often means a blocking trap.",
      text: "From the flow meter on the gas-handling panel.",
    },
    {
      id: "mxc-base",
      kind: "reading",
      quantity: "Mixing chamber temperature at base",
      unit: "mK",
      max: 20,
      ifOutOfRange:
        "Base is not reached. Leave it another hour; if it stays high, check the circulation rate and the still temperature.",
      text: "Read after the temperature has been steady for an hour.",
    },
    {
      id: "panel-photo",
      kind: "photo",
      text: "Photograph the gas-handling panel with valve positions and gauges at base temperature.",
    },
    {
      id: "hold-base",
      kind: "hold",
      role: "technician",
      text: "Base temperature reached and steady; the fridge is ready for measurements.",
    },
    { id: "remarks", kind: "note", text: "Anything the researcher or the next shift should know about this cooldown." },
  ],
};

const cooldownWet: TemplateDraft = {
  key: "cooldown-wet-bath",
  title: "Cooldown — helium-bath cryostat",
  purpose: "Pre-cool a bath cryostat with liquid nitrogen, clear the nitrogen out and make the first helium fill.",
  cryostatKinds: ["wet_bath", "test_dewar"],
  steps: [
    {
      id: "caution-cryogen",
      kind: "caution",
      topic: "cryogen",
      text:
        "Liquid nitrogen and liquid helium cause cold burns and make brittle anything they soak. Wear the face shield and cryogenic gloves; never seal a vessel that holds liquid." +
        DEFER,
    },
    {
      id: "caution-oxygen",
      kind: "caution",
      topic: "oxygen",
      text:
        "Every litre of liquid boils into hundreds of litres of gas that pushes out the air. Keep the room ventilation on and watch the oxygen monitors; leave the room if they alarm." +
        DEFER,
    },
    {
      id: "ovc-pressure",
      kind: "reading",
      quantity: "Vacuum space pressure",
      unit: "mbar",
      max: 0.001,
      ifOutOfRange: "Keep pumping; a soft vacuum boils cryogen away fast and may frost the outer wall.",
      text: "Read before any cryogen goes in.",
    },
    {
      id: "recovery",
      kind: "check",
      secondPerson: false,
      text: "Bath exhaust connected to the helium recovery line and the bath relief valve in place; nothing vents to the room.",
    },
    {
      id: "oxygen-before",
      kind: "reading",
      quantity: "Oxygen monitor reading",
      unit: "%",
      min: 19.5,
      ifOutOfRange: "Do not start. Leave the room and call the safety officer.",
      text: "The monitor next to the cryostat, before any liquid is poured.",
    },
    { id: "n2-jacket", kind: "check", secondPerson: false, text: "Nitrogen jacket filled (if the cryostat has one)." },
    {
      id: "n2-precool",
      kind: "check",
      secondPerson: false,
      text: "Helium bath pre-cooled with liquid nitrogen through the fill port, slowly, until the bath thermometer is near 77 K.",
    },
    {
      id: "bath-77",
      kind: "reading",
      quantity: "Bath temperature after nitrogen pre-cool",
      unit: "K",
      min: 70,
      max: 90,
      ifOutOfRange: "Pre-cool is not finished; wait and read again.",
      text: "Read the bath thermometer.",
    },
    {
      id: "n2-out",
      kind: "check",
      secondPerson: false,
      text: "All liquid nitrogen blown out of the helium bath with clean helium gas; the bath thermometer rises slightly above 77 K when the last liquid is gone.",
    },
    {
      id: "hold-n2-out",
      kind: "hold",
      role: "technician",
      text: "No nitrogen left in the helium bath. Nitrogen left behind freezes solid at helium temperature and can block the bath or the needle valve.",
    },
    {
      id: "caution-line",
      kind: "caution",
      topic: "transfer_line",
      text:
        "The transfer line is cold and stiff: handle it with gloves, never bend it sharply, and insert it slowly so warm gas does not boil off the first liquid." +
        DEFER,
    },
    {
      id: "he-fill",
      kind: "check",
      secondPerson: true,
      text: "First helium fill made with a second person present, slowly at first while the bath cools from 77 K.",
    },
    {
      id: "level-after",
      kind: "reading",
      quantity: "Helium level after the first fill",
      unit: "%",
      min: 60,
      ifOutOfRange: "Top up with a second transfer or note why it stopped early.",
      text: "Read the level meter once the reading settles.",
    },
    {
      id: "bath-4k",
      kind: "reading",
      quantity: "Bath temperature",
      unit: "K",
      max: 4.4,
      ifOutOfRange: "Liquid is not yet in contact with the thermometer; wait and read again.",
      text: "Read the bath thermometer.",
    },
    { id: "level-photo", kind: "photo", text: "Photograph the level meter display." },
    { id: "remarks", kind: "note", text: "Anything unusual: ice on the neck, a slow fill, supply dewar used." },
  ],
};

const warmupDry: TemplateDraft = {
  key: "warmup-dry-dilution",
  title: "Warmup — dry dilution refrigerator",
  purpose:
    "Bring a dilution refrigerator back to room temperature with all the mixture recovered to the tank, and vent it with dry gas.",
  cryostatKinds: ["dry_dilution"],
  steps: [
    {
      id: "caution-pressure",
      kind: "caution",
      topic: "pressure",
      text:
        "As the fridge warms, the mixture evaporates. It must have a free path to the tank: never close it into the fridge or a short line." +
        DEFER,
    },
    {
      id: "magnet-zero",
      kind: "reading",
      quantity: "Magnet field before warmup",
      unit: "T",
      max: 0.001,
      ifOutOfRange:
        "Ramp the magnet to zero first (magnet ramp procedure). A magnet warmed with current in it will quench.",
      text: "Read the supply or the last field record; persistent switch heater off only at zero.",
    },
    {
      id: "researcher-told",
      kind: "check",
      secondPerson: false,
      text: "The researcher on this fridge knows the warmup is starting and measurements are stopped.",
    },
    { id: "stop-circ", kind: "check", secondPerson: false, text: "Still heater off and circulation stopped." },
    {
      id: "recover",
      kind: "check",
      secondPerson: false,
      text: "Mixture recovery running: circuit opened towards the tank through the recovery path; cold trap kept cold until the recovery ends.",
    },
    {
      id: "tank-recovered",
      kind: "reading",
      quantity: "Mixture tank pressure after recovery",
      unit: "mbar",
      min: 780,
      max: 900,
      ifOutOfRange:
        "Mixture may be missing. Compare with the pressure before the last cooldown, keep the circuit closed, do not vent, and tell the facility admin.",
      text: "Read at room temperature, with the fridge still pumped down; write the tank temperature in the comment if it is not near 295 K.",
    },
    { id: "tank-photo", kind: "photo", text: "Photograph the tank gauge after recovery." },
    {
      id: "compressor-off",
      kind: "check",
      secondPerson: false,
      text: "Pulse-tube compressor off; cold trap isolated and left to warm with its own exhaust open.",
    },
    {
      id: "mxc-warm",
      kind: "reading",
      quantity: "Mixing chamber temperature before venting",
      unit: "K",
      min: 285,
      ifOutOfRange: "Wait. Venting a cold fridge condenses water and air on the cold parts.",
      text: "Every stage must be at room temperature before the vacuum is broken.",
    },
    {
      id: "pt1-warm",
      kind: "reading",
      quantity: "50 K plate temperature before venting",
      unit: "K",
      min: 285,
      ifOutOfRange: "Wait for the plate to reach room temperature.",
      text: "Read the 50 K plate thermometer.",
    },
    {
      id: "caution-vent",
      kind: "caution",
      topic: "pressure",
      text:
        "Vent slowly with dry nitrogen gas from the regulator, never with room air, and stop at atmospheric pressure: a vacuum can is not built to hold overpressure." +
        DEFER,
    },
    {
      id: "vent",
      kind: "check",
      secondPerson: false,
      text: "Vacuum can vented with dry nitrogen to atmospheric pressure.",
    },
    {
      id: "hold-open",
      kind: "hold",
      role: "technician",
      text: "Fridge warm, mixture in the tank and vacuum can vented: it may be opened.",
    },
    { id: "remarks", kind: "note", text: "Mixture accounting remarks and anything found during the warmup." },
  ],
};

const transfer: TemplateDraft = {
  key: "helium-transfer",
  title: "Liquid helium transfer",
  purpose:
    "Fill a helium bath from a supply dewar with two people, protective equipment and the oxygen monitors watched, and account for the helium taken.",
  cryostatKinds: ["wet_bath", "test_dewar"],
  steps: [
    {
      id: "caution-oxygen",
      kind: "caution",
      topic: "oxygen",
      text:
        "A transfer releases a lot of cold helium gas. Keep the ventilation on, watch the oxygen monitors and leave at once if they alarm; do not go back in to save the transfer." +
        DEFER,
    },
    {
      id: "people",
      recordField: "peoplePresent",
      kind: "check",
      secondPerson: true,
      text: "Two people present for the whole transfer; name the second person.",
    },
    {
      id: "ppe",
      recordField: "ppeConfirmed",
      kind: "check",
      secondPerson: false,
      text: "Face shield, cryogenic gloves, long sleeves and closed shoes worn by both people.",
    },
    {
      id: "oxygen-before",
      recordField: "oxygenMonitorChecked",
      kind: "reading",
      quantity: "Oxygen monitor reading before the transfer",
      unit: "%",
      min: 19.5,
      ifOutOfRange: "Do not start. Leave the room and call the safety officer.",
      text: "The monitor by the cryostat and the one at the helium manifold.",
    },
    {
      id: "level-before",
      recordField: "levelBeforePercent",
      kind: "reading",
      quantity: "Helium level before",
      unit: "%",
      ifOutOfRange: "",
      text: "Read the level meter before the line goes in.",
    },
    {
      id: "pressure-before",
      recordField: "pressureBeforeMbar",
      kind: "reading",
      quantity: "Bath pressure before",
      unit: "mbar",
      min: 990,
      max: 1100,
      ifOutOfRange: "Check the recovery line is open before inserting anything.",
      text: "Read the bath gauge.",
    },
    {
      id: "supply-before",
      recordField: "supplyMassBeforeKg",
      kind: "reading",
      quantity: "Supply dewar mass before",
      unit: "kg",
      ifOutOfRange: "",
      text: "Dewar on the floor scale; write the dewar name in the comment.",
    },
    {
      id: "caution-line",
      kind: "caution",
      topic: "transfer_line",
      text:
        "Check the line's vacuum jacket and tip before use. Insert it into the supply dewar first and let it cool until liquid reaches the tip, then into the cryostat slowly. Keep faces away from the ports." +
        DEFER,
    },
    {
      id: "line",
      recordField: "durationMin",
      kind: "check",
      secondPerson: false,
      text: "Transfer line inspected, cooled on the supply side, inserted into the cryostat; supply pressurised gently from the regulator only.",
    },
    {
      id: "oxygen-lowest",
      recordField: "oxygenLowestPercent",
      kind: "reading",
      quantity: "Lowest oxygen reading during the transfer",
      unit: "%",
      min: 19.5,
      ifOutOfRange:
        "If it fell below the alarm level the room should have been left: record what was done and tell the safety officer.",
      text: "Watch the monitors through the transfer.",
    },
    {
      id: "level-after",
      recordField: "levelAfterPercent",
      kind: "reading",
      quantity: "Helium level after",
      unit: "%",
      min: 60,
      max: 95,
      ifOutOfRange:
        "Below: note why the transfer stopped. Above 95 %: the bath may spill liquid into the recovery line.",
      text: "Read once the level settles.",
    },
    {
      id: "pressure-after",
      recordField: "pressureAfterMbar",
      kind: "reading",
      quantity: "Bath pressure after",
      unit: "mbar",
      min: 990,
      max: 1100,
      ifOutOfRange: "Check the recovery line and the bath relief valve.",
      text: "Read the bath gauge after the line is out.",
    },
    {
      id: "supply-after",
      recordField: "supplyMassAfterKg",
      kind: "reading",
      quantity: "Supply dewar mass after",
      unit: "kg",
      ifOutOfRange: "",
      text: "Same scale as before.",
    },
    {
      id: "line-out",
      recordField: "durationMin",
      kind: "check",
      secondPerson: false,
      text: "Line removed, ports capped, supply dewar depressurised and its valves closed.",
    },
    { id: "level-photo", kind: "photo", text: "Photograph the level meter after the transfer." },
    {
      id: "remarks",
      recordField: "anomalies",
      kind: "note",
      text: "Anything unusual: losses, ice plugs, a second dewar used.",
    },
  ],
};

const rampCommon = (maxRate: number, maxField: number): TemplateStep[] => [
  {
    id: "caution-magnet",
    kind: "caution",
    topic: "magnet",
    text:
      "The field reaches beyond the cryostat. Keep steel tools, gas bottles and anyone with a pacemaker or active implant outside the marked line. A quench boils helium away in seconds." +
      DEFER,
  },
  {
    id: "area-clear",
    kind: "check",
    secondPerson: false,
    text: "Area inside the marked field line clear: no loose steel, bottles chained, nobody with an implant.",
  },
  {
    id: "switch-state",
    kind: "check",
    secondPerson: false,
    text: "Persistent switch state known. If the magnet is persistent, the supply current has been set equal to the magnet current before the switch heater goes on.",
  },
  {
    id: "rate",
    kind: "reading",
    quantity: "Ramp rate set on the supply",
    unit: "T/min",
    min: 0,
    max: maxRate,
    ifOutOfRange: "Lower the ramp rate to the magnet's limit before starting.",
    text: "The rate entered on the magnet supply.",
  },
  {
    id: "target",
    kind: "reading",
    quantity: "Target field",
    unit: "T",
    min: -maxField,
    max: maxField,
    ifOutOfRange: "The target is beyond the magnet's rating: do not ramp.",
    text: "The field the researcher asked for.",
  },
  {
    id: "hold-ramp",
    kind: "hold",
    role: "researcher",
    text: "The researcher agrees to this ramp: sample and wiring ready, target and rate as written.",
  },
  {
    id: "ramped",
    kind: "check",
    secondPerson: false,
    text: "Ramp finished with no quench; if going persistent, switch heater off and supply ramped down after the switch has cooled.",
  },
  {
    id: "field-reached",
    kind: "reading",
    quantity: "Field reached",
    unit: "T",
    min: -maxField,
    max: maxField,
    ifOutOfRange: "",
    text: "Field from the supply or the magnet's own readout.",
  },
  { id: "remarks", kind: "note", text: "Persistent or driven, anything unusual during the ramp." },
];

const rampWet: TemplateDraft = {
  key: "magnet-ramp-wet",
  title: "Magnet ramp — bath cryostat",
  purpose:
    "Change the field of a superconducting magnet in a helium bath with enough helium, the area clear and the rate within the magnet's limit.",
  cryostatKinds: ["wet_bath"],
  steps: [
    {
      id: "level",
      kind: "reading",
      quantity: "Helium level before the ramp",
      unit: "%",
      min: 25,
      ifOutOfRange: "Do not ramp: fill the bath first. The coil must stay covered, and ramping boils more helium.",
      text: "Minimum from the facility rules for this cryostat.",
    },
    ...rampCommon(0.2, 14),
    {
      id: "level-after",
      kind: "reading",
      quantity: "Helium level after the ramp",
      unit: "%",
      min: 25,
      ifOutOfRange: "Plan a transfer now.",
      text: "Read the level meter.",
    },
  ],
};

const rampDry: TemplateDraft = {
  key: "magnet-ramp-dry",
  title: "Magnet ramp — dry dilution refrigerator",
  purpose:
    "Change the field of a conduction-cooled magnet with the 4 K plate cold, the area clear and the rate within the magnet's limit.",
  cryostatKinds: ["dry_dilution"],
  steps: [
    {
      id: "pt2-temp",
      kind: "reading",
      quantity: "4 K plate temperature before the ramp",
      unit: "K",
      max: 4.2,
      ifOutOfRange: "Do not ramp: the magnet has no margin. Find out why the plate is warm.",
      text: "A conduction-cooled magnet needs its plate cold before any current flows.",
    },
    ...rampCommon(0.15, 9),
    {
      id: "mxc-after",
      kind: "reading",
      quantity: "Mixing chamber temperature after the ramp",
      unit: "mK",
      max: 50,
      ifOutOfRange: "Eddy-current heating: wait for the fridge to recover before measuring.",
      text: "Read once the ramp has stopped.",
    },
  ],
};

const walkRound: TemplateDraft = {
  key: "shift-walk-round",
  title: "Shift handover walk-round",
  purpose: "What the outgoing person checks at the cryostat before the shift handover is signed.",
  cryostatKinds: ["dry_dilution", "wet_bath", "test_dewar"],
  steps: [
    {
      id: "alarms",
      kind: "check",
      secondPerson: false,
      text: "No active alarm on the cryostat, its pumps, compressor or monitors.",
    },
    {
      id: "oxygen",
      kind: "reading",
      quantity: "Oxygen monitor reading",
      unit: "%",
      min: 19.5,
      ifOutOfRange: "Leave the room and call the safety officer.",
      text: "The monitor next to this cryostat.",
    },
    {
      id: "services",
      kind: "check",
      secondPerson: false,
      text: "Cooling water, recovery line and pumps running as expected; no frost where there should be none.",
    },
    {
      id: "open-work",
      kind: "check",
      secondPerson: false,
      text: "Open procedures on this cryostat looked at; each is either finished or explained in the handover note.",
    },
    { id: "remarks", kind: "note", text: "What the next person should watch." },
  ],
};

export const DEFAULT_TEMPLATES: TemplateDraft[] = [
  cooldownDry,
  cooldownWet,
  warmupDry,
  transfer,
  rampWet,
  rampDry,
  walkRound,
];
