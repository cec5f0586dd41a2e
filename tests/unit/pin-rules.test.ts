// The signing PIN's rules (lib/signing/pin-rules.ts), shared by the PIN form and POST /api/pin.
// Refusing repeated digits and runs is common practice for numeric PINs (the guesses tried first).
import { describe, expect, it } from "vitest";
import { PIN_FORMAT_PROBLEM, PIN_GUESSABLE_PROBLEM, pinProblem } from "@/lib/signing/pin-rules";

describe("pinProblem", () => {
  it("accepts 6 to 12 digits that are neither one repeated digit nor a run", () => {
    for (const pin of ["482916", "739105", "120398", "482916739105", "112233", "135790", "0102030"]) {
      expect(`${pin} ${pinProblem(pin)}`).toBe(`${pin} null`);
    }
  });

  it("refuses what is not 6 to 12 digits", () => {
    for (const pin of ["", "48291", "4829167391053", "48291a", " 482916", "482916 ", "4829-16", "٤٨٢٩١٦"]) {
      expect(`${JSON.stringify(pin)} ${pinProblem(pin)}`).toBe(`${JSON.stringify(pin)} ${PIN_FORMAT_PROBLEM}`);
    }
  });

  it("refuses one digit repeated and runs of digits up or down, round from 9 to 0", () => {
    for (const pin of ["000000", "777777777777", "123456", "012345678901", "654321", "890123", "210987"]) {
      expect(`${pin} ${pinProblem(pin)}`).toBe(`${pin} ${PIN_GUESSABLE_PROBLEM}`);
    }
  });

  it("says the problem in plain words", () => {
    expect(PIN_FORMAT_PROBLEM).toBe("The PIN is 6 to 12 digits.");
    expect(PIN_GUESSABLE_PROBLEM).toBe("Choose a PIN that is not one repeated digit or a run of digits.");
  });
});
