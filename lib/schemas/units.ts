// Units a reading may carry. The trade's own symbols.
export const UNITS = [
  "K",
  "mK",
  "mbar",
  "bar",
  "Pa",
  "%",
  "L",
  "kg",
  "T",
  "mT",
  "A",
  "T/min",
  "L/min",
  "L/h",
  "W",
  "Ω",
  "V",
  "µmol/s",
  "S",
  "e²/h",
] as const;
export type Unit = (typeof UNITS)[number];
