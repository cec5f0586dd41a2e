// One line of plain words for a procedure step entry (screens, the run record, the logbook).
import { trim } from "@/lib/format";
import type { RunStepPayload } from "@/lib/schemas/run";

export function describeEntry(p: RunStepPayload): string {
  switch (p.kind) {
    case "check":
      return "Ticked";
    case "reading":
      return `${trim(p.value, 6)} ${p.unit}${p.outOfRange ? " (out of range)" : ""}`;
    case "note":
      return p.text;
    case "photo":
      return "Photo taken";
    case "caution":
      return "Read";
    case "hold":
      return p.statement;
  }
}
