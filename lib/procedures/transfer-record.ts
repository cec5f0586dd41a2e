// The transfer record a procedure run makes: a template whose steps name transfer fields
// (`recordField`, lib/schemas/template.ts) fills one `transfer` entry from the run's steps in
// force when it completes, so a transfer done as a procedure reaches the audit like one from the
// transfer form. Pure: the tablet builds the record it writes with the completion, the server
// builds it again from the stored run and refuses a record whose figures differ
// (db/queries/run-transfer.ts). Also the run's own flags as the auditor reads them.
import { type LevelCalibration, litresFromLevel, litresFromMass } from "@/lib/cryo";
import { formatIssues, type Payload, transferPayload } from "@/lib/schemas/entry";
import type { RecordField, TemplateStep } from "@/lib/schemas/template";
import type { RunEntry, RunState, StepState } from "./state";

export type TransferBuild = { ok: true; payload: Payload<"transfer"> } | { ok: false; problems: string[] };

/** True when runs of these steps make a transfer record. */
export function makesTransferRecord(steps: readonly TemplateStep[]): boolean {
  return steps.some((s) => "recordField" in s && s.recordField !== undefined);
}

const round1 = (x: number) => Math.round(x * 10) / 10;

function fieldOf<E extends RunEntry>(s: StepState<E>): RecordField | undefined {
  return "recordField" in s.step ? s.step.recordField : undefined;
}

/** The value of a reading step's last entry in force. */
function readingOf<E extends RunEntry>(s: StepState<E>): { value: number; comment?: string } | undefined {
  const p = s.current.at(-1)?.payload;
  return p?.kind === "reading" ? { value: p.value, comment: p.comment } : undefined;
}

/**
 * Build the transfer record from a run's steps in force. `calibration` is the cryostat's level
 * calibration (litres gained come from the two levels through it); without one, or with a level
 * outside it, the litres gained are recorded as 0 and the anomalies say why.
 *
 * - peoplePresent: who recorded each "people" check, and the second person each names;
 * - supplyDewar: the first line of the comment on the supply mass reading (the template asks for
 *   the dewar's name there), else "not named in the run";
 * - suppliedLitres: the supply's mass difference as liquid helium (lib/cryo litresFromMass),
 *   suppliedBy "weight";
 * - durationMin: minutes from the first to the last entry of the steps marked durationMin;
 * - numbers to 0.1 where computed, readings as written.
 */
export function transferFromRun<E extends RunEntry>(
  state: Pick<RunState<E>, "steps" | "start">,
  { calibration }: { calibration?: LevelCalibration } = {},
): TransferBuild {
  const problems: string[] = [];
  const mapped = state.steps.filter((s) => fieldOf(s) !== undefined);
  if (!mapped.length) return { ok: false, problems: ["This procedure does not make a transfer record."] };
  const withField = (f: RecordField) => mapped.filter((s) => fieldOf(s) === f);
  const single = (f: RecordField) => {
    const s = withField(f)[0];
    return s ? readingOf(s) : undefined;
  };
  const need = (f: RecordField, label: string) => {
    const r = single(f);
    if (!r) problems.push(`${label} is not recorded in the run.`);
    return r;
  };

  const people: string[] = [];
  for (const s of withField("peoplePresent"))
    for (const e of s.current) {
      people.push(e.authorId);
      if (e.payload.kind === "check" && e.payload.secondPersonId) people.push(e.payload.secondPersonId);
    }
  if (!withField("peoplePresent").length && state.start) people.push(state.start.authorId);

  const ppeSteps = withField("ppeConfirmed");
  const ppeConfirmed = ppeSteps.length > 0 && ppeSteps.every((s) => s.current.length > 0);
  const monitorSteps = withField("oxygenMonitorChecked");
  const oxygenMonitorChecked = monitorSteps.length > 0 && monitorSteps.every((s) => s.current.length > 0);
  const oxygen = [...monitorSteps, ...withField("oxygenLowestPercent")]
    .map(readingOf)
    .flatMap((r) => (r ? [r.value] : []));

  const levelBefore = need("levelBeforePercent", "The level before");
  const levelAfter = need("levelAfterPercent", "The level after");
  const massBefore = need("supplyMassBeforeKg", "The supply dewar's mass before");
  const massAfter = need("supplyMassAfterKg", "The supply dewar's mass after");
  const pressureBefore = single("pressureBeforeMbar");
  const pressureAfter = single("pressureAfterMbar");

  let suppliedLitres: number | undefined;
  if (massBefore && massAfter) {
    try {
      suppliedLitres = round1(litresFromMass(massBefore.value - massAfter.value));
    } catch {
      problems.push(
        `The supply dewar weighs more after (${massAfter.value} kg) than before (${massBefore.value} kg): correct the masses.`,
      );
    }
  }

  const anomalies: string[] = [];
  let gainedLitres = 0;
  if (levelBefore && levelAfter) {
    if (!calibration) anomalies.push("No level calibration for this cryostat: litres gained not computed (0 L).");
    else
      try {
        gainedLitres = round1(
          Math.max(0, litresFromLevel(levelAfter.value, calibration) - litresFromLevel(levelBefore.value, calibration)),
        );
      } catch {
        anomalies.push("A level lies outside the cryostat's level calibration: litres gained not computed (0 L).");
      }
  }
  for (const s of withField("anomalies"))
    for (const e of s.current) if (e.payload.kind === "note") anomalies.push(e.payload.text);

  const times = withField("durationMin")
    .flatMap((s) => s.current.map((e) => Date.parse(e.recordedAt)))
    .filter(Number.isFinite);
  const durationMin = times.length ? round1((Math.max(...times) - Math.min(...times)) / 60_000) : 0;

  const dewar = (massBefore?.comment ?? massAfter?.comment ?? "").split("\n")[0]!.trim().slice(0, 40).trim();

  if (problems.length) return { ok: false, problems };
  const raw = {
    supplyDewar: dewar || "not named in the run",
    peoplePresent: [...new Set(people)],
    ppeConfirmed,
    oxygenMonitorChecked,
    ...(oxygen.length ? { oxygenLowestPercent: Math.min(...oxygen) } : {}),
    levelBeforePercent: levelBefore!.value,
    levelAfterPercent: levelAfter!.value,
    ...(pressureBefore ? { pressureBeforeMbar: pressureBefore.value } : {}),
    ...(pressureAfter ? { pressureAfterMbar: pressureAfter.value } : {}),
    suppliedLitres: suppliedLitres!,
    suppliedBy: "weight" as const,
    supplyMassBeforeKg: massBefore!.value,
    supplyMassAfterKg: massAfter!.value,
    gainedLitres,
    durationMin,
    anomalies: anomalies.join("\n").slice(0, 2000),
  };
  const parsed = transferPayload.safeParse(raw);
  if (!parsed.success) return { ok: false, problems: formatIssues(parsed.error, "transfer") };
  return { ok: true, payload: parsed.data };
}

function label(step: TemplateStep): string {
  if (step.kind === "reading") return step.quantity;
  return step.text.length > 60 ? `${step.text.slice(0, 59)}…` : step.text;
}

/**
 * What the auditor should see of a run beside its transfer record: every step's problem (an
 * out-of-range reading with its value and range, a missing second person, work recorded before a
 * hold point was signed), every hold point not signed, and the run's own flags.
 */
export function runFlagsForAudit<E extends RunEntry>(state: Pick<RunState<E>, "steps" | "flags">): string[] {
  const out: string[] = [];
  for (const s of state.steps) {
    const r = s.step.kind === "reading" ? readingOf(s) : undefined;
    const what = s.step.kind === "reading" && r ? `${label(s.step)}: ${r.value} ${s.step.unit}` : `${label(s.step)}`;
    for (const p of s.problems) out.push(`${what} — ${p}`);
    if (s.step.kind === "reading" && r && s.problems.length && r.comment?.trim())
      out.push(`${label(s.step)} — comment: ${r.comment.trim()}`);
    if (s.step.kind === "hold" && !s.releasedAt)
      out.push(`Hold point not signed by a ${s.step.role.replace("_", " ")}: ${label(s.step)}`);
  }
  out.push(...state.flags);
  return out;
}
