"use client";
// A numeric keypad with keys big enough for a gloved finger: the tablet's own keyboard is small
// and hides half the screen. Typing on a hardware keyboard works too (the field stays editable).
import { Button } from "@/components/ui/button";
import { readTypedNumber } from "@/lib/typed-number";

const KEYS = ["7", "8", "9", "4", "5", "6", "1", "2", "3", "−", "0", "."] as const;

export function applyKey(value: string, key: string): string {
  if (key === "⌫") return value.slice(0, -1);
  if (key === "−") return value.startsWith("-") ? value.slice(1) : `-${value}`;
  if (key === "." && value.includes(".")) return value;
  if (key === "." && (value === "" || value === "-")) return `${value}0.`;
  if (value.replace(/[-.]/g, "").length >= 12) return value;
  return value + key;
}

/**
 * The typed text as a number, or null while it is empty or half-typed ("-", "3."). The keypad's
 * field holds digits, one point and a sign only (it filters out the rest), so anything else is not
 * a keypad value either; what is left is read by the shared parser (lib/typed-number.ts).
 */
export function keypadNumber(value: string): number | null {
  const t = value.trim();
  if (!/^-?\d*\.?\d*$/.test(t) || /^-?\.?$/.test(t) || t.endsWith(".")) return null;
  return readTypedNumber(t) ?? null;
}

export function Keypad({ value, onChange, label }: { value: string; onChange: (v: string) => void; label: string }) {
  return (
    <div role="group" aria-label={label} className="grid grid-cols-3 gap-2">
      {KEYS.map((k) => (
        <Button
          key={k}
          onClick={() => onChange(applyKey(value, k))}
          className="num min-h-16 text-3xl!"
          aria-label={k === "−" ? "Change sign" : k === "." ? "Decimal point" : k}
        >
          {k}
        </Button>
      ))}
      <Button
        onClick={() => onChange(applyKey(value, "⌫"))}
        className="col-span-2 min-h-14 text-xl"
        aria-label="Delete last digit"
      >
        ⌫ Delete
      </Button>
      <Button onClick={() => onChange("")} className="min-h-14 text-xl" aria-label="Clear the value">
        Clear
      </Button>
    </div>
  );
}
