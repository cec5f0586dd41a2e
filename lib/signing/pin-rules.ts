// What a signing PIN may be, checked the same way on the tablet (before sending) and by the
// server (POST /api/pin): 6 to 12 digits, not one digit repeated, not a run of consecutive digits
// up or down (counted round from 9 to 0, so "890123" is a run too). Pure; no I/O.
import { PIN_PATTERN } from "./proof";

const UP = "01234567890123456789";
const DOWN = "98765432109876543210";

export const PIN_FORMAT_PROBLEM = "The PIN is 6 to 12 digits.";
export const PIN_GUESSABLE_PROBLEM = "Choose a PIN that is not one repeated digit or a run of digits.";

/** The PIN's problem in plain words, or null when it may be used. */
export function pinProblem(pin: string): string | null {
  if (!PIN_PATTERN.test(pin)) return PIN_FORMAT_PROBLEM;
  if (/^(\d)\1+$/.test(pin) || UP.includes(pin) || DOWN.includes(pin)) return PIN_GUESSABLE_PROBLEM;
  return null;
}
