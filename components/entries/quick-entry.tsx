"use client";
// Quick entries on the cryostat page: a reading, a note, a helium level, a field setting.
// Big targets, the numeric keypad for figures, and "Saved on this tablet" only once the local
// transaction has committed; a failed local write is shown as an error, never hidden.
import { zodResolver } from "@hookform/resolvers/zod";
import { type ReactNode, useState } from "react";
import { type DefaultValues, type FieldValues, useForm } from "react-hook-form";
import type { z } from "zod";
import { DerivedValue } from "@/components/cryo/derived-value";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice, Panel } from "@/components/ui/panel";
import type { Role } from "@/lib/auth/permissions";
import { mayWrite } from "@/lib/auth/permissions";
import { type LocalCryostat, useFacilityRules } from "@/lib/local/hooks";
import { type EntryDraft, LocalWriteError, recordEntry } from "@/lib/local/record";
import { magnetLimitsExceeded } from "@/lib/record/magnet";
import { UNITS } from "@/lib/schemas/units";
import { typedNumber } from "@/lib/typed-number";
import { fieldForm, heliumForm, noteForm, readingForm } from "./form-schemas";

type Tab = "reading" | "note" | "helium.level" | "field.setting";
const TAB_LABEL: Record<Tab, string> = {
  reading: "Reading",
  note: "Note",
  "helium.level": "Helium level",
  "field.setting": "Field setting",
};

type Outcome = { tone: "ok" | "danger"; text: string } | null;

export function QuickEntry({ cryostat, role }: { cryostat: LocalCryostat; role: Role | null }) {
  const tabs = (Object.keys(TAB_LABEL) as Tab[]).filter(
    (t) =>
      (!role || mayWrite(role, t)) &&
      (t !== "helium.level" || Boolean(cryostat.config.reservoir)) &&
      (t !== "field.setting" || Boolean(cryostat.config.magnet)),
  );
  const [tab, setTab] = useState<Tab>("reading");
  const [outcome, setOutcome] = useState<Outcome>(null);
  const active = tabs.includes(tab) ? tab : (tabs[0] ?? "note");

  /** Write locally; resolves true once committed. */
  const save = async (draft: EntryDraft<Tab>): Promise<boolean> => {
    setOutcome(null);
    try {
      await recordEntry(draft);
      // Committed with strict durability: the moment bench/sync measures as "durable".
      performance.mark("rimelog:entry-durable");
      setOutcome({ tone: "ok", text: `${TAB_LABEL[draft.kind]} saved on this tablet.` });
      return true;
    } catch (e) {
      setOutcome({
        tone: "danger",
        text: e instanceof LocalWriteError ? e.message : `Not saved: ${(e as Error).message}`,
      });
      return false;
    }
  };

  return (
    <Panel aria-labelledby="quick-entry-title">
      <h2 id="quick-entry-title" className="mb-3 text-xl font-bold">
        Record
      </h2>
      <div role="tablist" aria-label="What to record" className="mb-4 flex flex-wrap gap-2">
        {tabs.map((t) => (
          <button
            key={t}
            type="button"
            role="tab"
            aria-selected={active === t}
            onClick={() => {
              setTab(t);
              setOutcome(null);
            }}
            className={`min-h-12 rounded-xl border-2 px-4 font-semibold ${active === t ? "border-accent bg-accent text-accent-ink" : "border-line bg-panel text-ink hover:bg-sunk"}`}
          >
            {TAB_LABEL[t]}
          </button>
        ))}
      </div>
      <div role="tabpanel" aria-label={TAB_LABEL[active]}>
        {active === "reading" && <ReadingForm cryostat={cryostat} save={save} />}
        {active === "note" && <NoteForm cryostatId={cryostat.id} save={save} />}
        {active === "helium.level" && <HeliumForm cryostat={cryostat} save={save} />}
        {active === "field.setting" && <FieldForm cryostat={cryostat} save={save} />}
      </div>
      {outcome && (
        <div className="mt-3">
          <Notice tone={outcome.tone} role={outcome.tone === "ok" ? "status" : "alert"}>
            {outcome.text}
          </Notice>
        </div>
      )}
    </Panel>
  );
}

type Save = (d: EntryDraft<Tab>) => Promise<boolean>;

/** A form over one of the form schemas: its controls hold the schema's input (typed text), its submit gets the output. */
function useEntryForm<In extends FieldValues, Out>(schema: z.ZodType<Out, In>, defaults: DefaultValues<In>) {
  return useForm<In, unknown, Out>({ resolver: zodResolver(schema), defaultValues: defaults });
}

function FormShell({
  onSubmit,
  busy,
  label,
  children,
}: {
  onSubmit: () => void;
  busy: boolean;
  label: string;
  children: ReactNode;
}) {
  return (
    <form
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit();
      }}
      className="grid gap-4 sm:grid-cols-2"
    >
      {children}
      <Button type="submit" variant="primary" disabled={busy} className="text-lg sm:col-span-2">
        {busy ? "Saving…" : label}
      </Button>
    </form>
  );
}

const err = (e: unknown) => (e as { message?: string } | undefined)?.message;

function ReadingForm({ cryostat, save }: { cryostat: LocalCryostat; save: Save }) {
  const stages = cryostat.config.stages;
  const f = useEntryForm(readingForm, {
    quantity: "Temperature",
    stage: stages[0]?.key ?? "",
    value: "",
    unit: "K",
    comment: "",
  });
  const errors = f.formState.errors;
  const submit = f.handleSubmit(async (v) => {
    const ok = await save({ cryostatId: cryostat.id, kind: "reading", payload: v });
    if (ok) f.reset({ ...v, value: "", comment: "" });
  });
  return (
    <FormShell onSubmit={() => void submit()} busy={f.formState.isSubmitting} label="Save reading">
      <TextField label="Quantity" id="reading-quantity" {...f.register("quantity")} error={err(errors.quantity)} />
      <SelectField
        label="Stage"
        id="reading-stage"
        {...f.register("stage")}
        options={[...stages.map((s) => ({ value: s.key, label: s.label })), { value: "", label: "No stage" }]}
        error={err(errors.stage)}
      />
      <TextField
        label="Value"
        id="reading-value"
        inputMode="decimal"
        autoComplete="off"
        className="num"
        {...f.register("value")}
        error={err(errors.value)}
      />
      <SelectField
        label="Unit"
        id="reading-unit"
        {...f.register("unit")}
        options={UNITS.map((u) => ({ value: u, label: u }))}
        error={err(errors.unit)}
      />
      <div className="sm:col-span-2">
        <DerivedValue
          id="reading-derived"
          cryostat={cryostat}
          quantity={f.watch("quantity")}
          unit={f.watch("unit")}
          value={f.watch("value")}
          stage={f.watch("stage")}
        />
      </div>
      <TextField
        label="Comment (optional)"
        id="reading-comment"
        className="sm:col-span-2"
        {...f.register("comment")}
        error={err(errors.comment)}
      />
    </FormShell>
  );
}

function NoteForm({ cryostatId, save }: { cryostatId: string; save: Save }) {
  const f = useEntryForm(noteForm, { text: "" });
  const submit = f.handleSubmit(async (v) => {
    if (await save({ cryostatId, kind: "note", payload: v })) f.reset({ text: "" });
  });
  const e = err(f.formState.errors.text);
  return (
    <FormShell onSubmit={() => void submit()} busy={f.formState.isSubmitting} label="Save note">
      <div className="flex flex-col gap-1 sm:col-span-2">
        <label htmlFor="note-text" className="font-semibold">
          Note
        </label>
        <textarea
          id="note-text"
          rows={4}
          aria-invalid={Boolean(e)}
          aria-describedby={e ? "note-text-error" : undefined}
          className="w-full rounded-xl border-2 border-line bg-bg px-4 py-2 text-lg text-ink focus:border-accent"
          {...f.register("text")}
        />
        {e && (
          <p id="note-text-error" className="text-sm font-semibold text-danger">
            {e}
          </p>
        )}
      </div>
    </FormShell>
  );
}

function HeliumForm({ cryostat, save }: { cryostat: LocalCryostat; save: Save }) {
  const cryostatId = cryostat.id;
  const f = useEntryForm(heliumForm, { percent: "", litres: "" });
  const errors = f.formState.errors;
  const submit = f.handleSubmit(async (v) => {
    if (await save({ cryostatId, kind: "helium.level", payload: v })) f.reset({ percent: "", litres: "" });
  });
  return (
    <FormShell onSubmit={() => void submit()} busy={f.formState.isSubmitting} label="Save helium level">
      <TextField
        label="Level (%)"
        id="helium-percent"
        inputMode="decimal"
        autoComplete="off"
        {...f.register("percent")}
        error={err(errors.percent)}
      />
      <TextField
        label="Litres (optional)"
        id="helium-litres"
        inputMode="decimal"
        autoComplete="off"
        {...f.register("litres")}
        error={err(errors.litres)}
      />
      <div className="sm:col-span-2">
        <DerivedValue
          id="helium-derived"
          cryostat={cryostat}
          quantity="Helium level"
          unit="%"
          value={f.watch("percent")}
        />
      </div>
    </FormShell>
  );
}

const EMPTY_FIELD = {
  currentA: "",
  fieldT: "",
  persistent: false,
  rampRateTPerMin: "",
  comment: "",
  limitOverrideReason: "",
};

function FieldForm({ cryostat, save }: { cryostat: LocalCryostat; save: Save }) {
  const cryostatId = cryostat.id;
  const rules = useFacilityRules();
  const f = useEntryForm(fieldForm, EMPTY_FIELD);
  const errors = f.formState.errors;
  // The same limits the server enforces (lib/record/magnet.ts), shown before saving.
  const [a, t, r] = f.watch(["currentA", "fieldT", "rampRateTPerMin"]);
  const exceeded = cryostat.config.magnet
    ? magnetLimitsExceeded(
        { currentA: typedNumber(a) ?? 0, fieldT: typedNumber(t) ?? 0, rampRateTPerMin: typedNumber(r) },
        cryostat.config.magnet,
        rules?.values.maxRampTPerMin[cryostatId],
      )
    : [];
  const [overrideProblem, setOverrideProblem] = useState<string | null>(null);
  const submit = f.handleSubmit(async (v) => {
    if (exceeded.length && !v.limitOverrideReason) {
      setOverrideProblem("Beyond the magnet's limits: give the reason for the override, or correct the values.");
      return;
    }
    setOverrideProblem(null);
    if (
      await save({
        cryostatId,
        kind: "field.setting",
        payload: exceeded.length ? v : { ...v, limitOverrideReason: undefined },
      })
    )
      f.reset(EMPTY_FIELD);
  });
  return (
    <FormShell onSubmit={() => void submit()} busy={f.formState.isSubmitting} label="Save field setting">
      <TextField
        label="Field (T)"
        id="field-t"
        inputMode="decimal"
        autoComplete="off"
        {...f.register("fieldT")}
        error={err(errors.fieldT)}
      />
      <TextField
        label="Current (A)"
        id="field-a"
        inputMode="decimal"
        autoComplete="off"
        {...f.register("currentA")}
        error={err(errors.currentA)}
      />
      <div className="sm:col-span-2">
        <DerivedValue
          id="field-derived"
          cryostat={cryostat}
          quantity="Magnet current"
          unit="A"
          value={f.watch("currentA")}
        />
      </div>
      <TextField
        label="Ramp rate (T/min, optional)"
        id="field-ramp"
        inputMode="decimal"
        autoComplete="off"
        {...f.register("rampRateTPerMin")}
        error={err(errors.rampRateTPerMin)}
      />
      <label className="flex min-h-12 items-center gap-3 self-end rounded-xl border-2 border-line px-4 font-semibold">
        <input type="checkbox" className="h-6 w-6" {...f.register("persistent")} />
        Persistent mode
      </label>
      <TextField
        label="Comment (optional)"
        id="field-comment"
        className="sm:col-span-2"
        {...f.register("comment")}
        error={err(errors.comment)}
      />
      {exceeded.length > 0 && (
        <div className="flex flex-col gap-2 sm:col-span-2">
          <Notice tone="danger" role="alert" title="Beyond the magnet's limits">
            {exceeded.join("; ")}. Follow the maker's rating and the facility's magnet rules; only a setting the
            facility has approved may be saved, with its reason (the safety officer sees it).
          </Notice>
          <TextField
            label="Reason for the override (required beyond the limits)"
            id="field-override"
            {...f.register("limitOverrideReason")}
            error={overrideProblem ?? err(errors.limitOverrideReason)}
          />
        </div>
      )}
    </FormShell>
  );
}
