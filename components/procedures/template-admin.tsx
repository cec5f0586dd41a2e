"use client";
// The facility admin's procedure templates: every key with its newest version and history, and
// an editor (react-hook-form + the shared zod schema) whose save makes the next version. Runs
// already started keep the version they pinned.
import { zodResolver } from "@hookform/resolvers/zod";
import { useCallback, useEffect, useState } from "react";
import {
  type Control,
  type RegisterOptions,
  type UseFormRegister,
  useFieldArray,
  useForm,
  useWatch,
} from "react-hook-form";
import type { z } from "zod";
import { NotAllowed } from "@/components/shell/not-allowed";
import { useMe } from "@/components/shell/use-me";
import { syncSoon } from "@/components/sync/runtime";
import { Button } from "@/components/ui/button";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { api, problemList, problemText } from "@/components/ui/use-json";
import { formatDate } from "@/lib/format";
import type { CryostatKind } from "@/lib/schemas/cryostat";
import { templateInputSchema } from "@/lib/schemas/run";
import type { TemplateStep } from "@/lib/schemas/template";
import { UNITS } from "@/lib/schemas/units";
import { typedNumber } from "@/lib/typed-number";

type Template = {
  id: string;
  key: string;
  version: number;
  title: string;
  purpose: string;
  cryostatKinds: CryostatKind[];
  steps: TemplateStep[];
  createdAt: string;
  createdBy: string;
};
type FormIn = z.input<typeof templateInputSchema>;
type FormOut = z.output<typeof templateInputSchema>;
type StepInput = FormIn["steps"][number];
/** Every field name some kind of step has. */
type StepField = StepInput extends infer S ? (S extends unknown ? keyof S & string : never) : never;

const KINDS = [
  ["dry_dilution", "Dry dilution refrigerator"],
  ["wet_bath", "Helium-bath cryostat"],
  ["test_dewar", "Test dewar"],
] as const;
const STEP_KINDS = ["check", "reading", "hold", "note", "photo", "caution"] as const;
const ROLES = ["technician", "researcher", "safety_officer", "facility_admin"] as const;
const TOPICS = ["cryogen", "oxygen", "pressure", "transfer_line", "magnet"] as const;
const INPUT = "min-h-12 w-full rounded-xl border-2 border-line bg-bg px-3 text-lg";
/** A typed limit (lib/typed-number.ts): undefined when empty, NaN (refused by the schema) when not a number. */
const optionalNumber = (v: unknown) =>
  typeof v === "string" ? typedNumber(v) : v === null || v === undefined || Number.isNaN(v) ? undefined : Number(v);

export function TemplateAdmin() {
  const { me } = useMe();
  const [list, setList] = useState<Template[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [editing, setEditing] = useState<{ base: Template | null } | null>(null);

  const load = useCallback(async () => {
    try {
      setList((await api<{ templates?: Template[] }>("/api/templates")).templates ?? []);
    } catch (e) {
      setError(problemText(e, "No connection: templates are edited online."));
    }
  }, []);
  useEffect(() => {
    void load();
  }, [load]);

  if (me && me.role !== "facility_admin") return <NotAllowed need="facility admin" />;
  if (error)
    return (
      <Notice tone="danger" title="Could not load the templates" role="alert">
        {error}
      </Notice>
    );
  if (!list) return <Loading label="Loading templates…" />;
  if (editing)
    return (
      <TemplateEditor
        base={editing.base}
        onDone={() => {
          setEditing(null);
          void load();
        }}
      />
    );

  const keys = [...new Set(list.map((t) => t.key))];
  return (
    <div className="flex flex-col gap-4">
      <Button variant="primary" className="self-start" onClick={() => setEditing({ base: null })}>
        + New procedure
      </Button>
      {keys.map((k) => {
        const versions = list.filter((t) => t.key === k).sort((a, b) => b.version - a.version);
        const latest = versions[0]!;
        return (
          <Panel key={k} aria-labelledby={`tpl-${k}`} className="flex flex-col gap-2">
            <div className="flex flex-wrap items-center gap-2">
              <h2 id={`tpl-${k}`} className="text-xl font-bold">
                {latest.title}
              </h2>
              <Tag tone="accent">version {latest.version}</Tag>
              <span className="text-sm text-muted">
                {latest.steps.length} steps · {latest.cryostatKinds.join(", ").replaceAll("_", " ")}
              </span>
              <Button
                className="ml-auto"
                onClick={() => setEditing({ base: latest })}
                aria-label={`Edit ${latest.title}`}
              >
                Edit
              </Button>
            </div>
            <p className="text-muted">{latest.purpose}</p>
            <p className="text-sm text-muted">
              Versions: {versions.map((v) => `v${v.version} (${formatDate(v.createdAt)})`).join(" · ")}
            </p>
          </Panel>
        );
      })}
    </div>
  );
}

function TemplateEditor({ base, onDone }: { base: Template | null; onDone: () => void }) {
  const [serverError, setServerError] = useState<{ message: string; details: string[] } | null>(null);
  const { register, control, handleSubmit, formState } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(templateInputSchema),
    defaultValues: base
      ? ({
          key: base.key,
          title: base.title,
          purpose: base.purpose,
          cryostatKinds: base.cryostatKinds,
          steps: base.steps,
        } satisfies FormIn)
      : {
          key: "",
          title: "",
          purpose: "",
          cryostatKinds: [],
          steps: [{ id: "step-1", kind: "check", text: "", secondPerson: false }],
        },
  });
  const steps = useFieldArray({ control, name: "steps" });
  const errors = formState.errors;

  const save = handleSubmit(async (data) => {
    setServerError(null);
    try {
      await api("/api/templates", { json: { basedOnVersion: base?.version ?? null, template: data } });
    } catch (e) {
      setServerError({
        message: problemText(e, "No connection: templates are edited online. Nothing was saved."),
        details: problemList(e),
      });
      return;
    }
    syncSoon(); // the procedures on this tablet read the templates from its store
    onDone();
  });

  return (
    <form onSubmit={(e) => void save(e)} className="flex flex-col gap-4" aria-label="Procedure template">
      <Notice tone="neutral">
        {base
          ? `Saving makes version ${base.version + 1} of "${base.key}". Runs already started keep the version they began with.`
          : "A new procedure starts at version 1."}
      </Notice>
      <Panel className="grid gap-3 md:grid-cols-2">
        <label className="flex flex-col gap-1 font-semibold">
          Key (letters, digits, dashes)
          <input {...register("key")} readOnly={Boolean(base)} className={INPUT} />
          {errors.key && <span className="text-sm text-danger">{errors.key.message}</span>}
        </label>
        <label className="flex flex-col gap-1 font-semibold">
          Title
          <input {...register("title")} className={INPUT} />
          {errors.title && <span className="text-sm text-danger">{errors.title.message}</span>}
        </label>
        <label className="flex flex-col gap-1 font-semibold md:col-span-2">
          Purpose
          <textarea
            {...register("purpose")}
            rows={2}
            className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
          />
          {errors.purpose && <span className="text-sm text-danger">{errors.purpose.message}</span>}
        </label>
        <fieldset className="md:col-span-2">
          <legend className="font-semibold">For cryostats of kind</legend>
          <div className="flex flex-wrap gap-3">
            {KINDS.map(([v, label]) => (
              <label key={v} className="flex min-h-12 items-center gap-2">
                <input type="checkbox" value={v} {...register("cryostatKinds")} className="h-6 w-6" /> {label}
              </label>
            ))}
          </div>
          {errors.cryostatKinds && <span className="text-sm text-danger">{errors.cryostatKinds.message}</span>}
        </fieldset>
      </Panel>
      <ol className="flex flex-col gap-3">
        {steps.fields.map((f, i) => (
          <li key={f.id}>
            <Panel className="flex flex-col gap-2">
              <div className="flex flex-wrap items-center gap-2">
                <span className="num text-lg font-bold">{i + 1}.</span>
                <Button
                  onClick={() => i > 0 && steps.move(i, i - 1)}
                  disabled={i === 0}
                  aria-label={`Move step ${i + 1} up`}
                >
                  ↑
                </Button>
                <Button
                  onClick={() => i < steps.fields.length - 1 && steps.move(i, i + 1)}
                  disabled={i === steps.fields.length - 1}
                  aria-label={`Move step ${i + 1} down`}
                >
                  ↓
                </Button>
                <Button
                  variant="ghost"
                  className="ml-auto text-danger"
                  onClick={() => steps.remove(i)}
                  aria-label={`Remove step ${i + 1}`}
                >
                  Remove
                </Button>
              </div>
              <StepFields i={i} register={register} control={control} errors={errors.steps?.[i]} />
            </Panel>
          </li>
        ))}
      </ol>
      {errors.steps?.message && <p className="text-danger">{errors.steps.message}</p>}
      <Button
        onClick={() =>
          steps.append({ id: `step-${steps.fields.length + 1}`, kind: "check", text: "", secondPerson: false })
        }
        className="self-start"
      >
        + Add a step
      </Button>
      {serverError && (
        <Notice tone="danger" title={serverError.message} role="alert">
          {serverError.details.length > 0 && (
            <ul className="list-disc pl-5">
              {serverError.details.map((d) => (
                <li key={d}>{d}</li>
              ))}
            </ul>
          )}
        </Notice>
      )}
      <div className="flex gap-2">
        <Button onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : base ? `Save as version ${base.version + 1}` : "Save version 1"}
        </Button>
      </div>
    </form>
  );
}

function StepFields({
  i,
  register,
  control,
  errors,
}: {
  i: number;
  register: UseFormRegister<FormIn>;
  control: Control<FormIn>;
  errors?: Partial<Record<StepField, { message?: string | undefined }>>;
}) {
  const kind = useWatch({ control, name: `steps.${i}.kind` });
  const err = (k: StepField) =>
    errors?.[k]?.message ? <span className="text-sm text-danger">{errors[k]!.message}</span> : null;
  // The step is a union by kind: a field of any kind's step (the schema checks the kind's own on save).
  const r = (name: StepField, opts?: RegisterOptions<FormIn, `steps.${number}.${StepField}`>) =>
    register(`steps.${i}.${name}`, opts);
  return (
    <div className="grid gap-3 md:grid-cols-3">
      <label className="flex flex-col gap-1 font-semibold">
        Kind
        <select {...r("kind")} className={INPUT}>
          {STEP_KINDS.map((k) => (
            <option key={k} value={k}>
              {k === "hold" ? "hold point" : k}
            </option>
          ))}
        </select>
      </label>
      <label className="flex flex-col gap-1 font-semibold">
        Step id
        <input {...r("id")} className={INPUT} />
        {err("id")}
      </label>
      <label className="flex flex-col gap-1 font-semibold md:col-span-3">
        Text shown to the technician
        <textarea {...r("text")} rows={2} className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg" />
        {err("text")}
      </label>
      {kind === "check" && (
        <label className="flex min-h-12 items-center gap-2 font-semibold">
          <input type="checkbox" {...r("secondPerson")} className="h-6 w-6" /> Requires a second person
        </label>
      )}
      {kind === "reading" && (
        <>
          <label className="flex flex-col gap-1 font-semibold">
            Quantity
            <input {...r("quantity")} className={INPUT} />
            {err("quantity")}
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Unit
            <select {...r("unit")} className={INPUT}>
              {UNITS.map((u) => (
                <option key={u} value={u}>
                  {u}
                </option>
              ))}
            </select>
          </label>
          <div className="grid grid-cols-2 gap-2">
            <label className="flex flex-col gap-1 font-semibold">
              Lowest
              <input inputMode="decimal" {...r("min", { setValueAs: optionalNumber })} className={INPUT} />
            </label>
            <label className="flex flex-col gap-1 font-semibold">
              Highest
              <input inputMode="decimal" {...r("max", { setValueAs: optionalNumber })} className={INPUT} />
              {err("max")}
            </label>
          </div>
          <label className="flex flex-col gap-1 font-semibold md:col-span-3">
            What to do when out of range
            <input {...r("ifOutOfRange")} className={INPUT} />
          </label>
        </>
      )}
      {kind === "hold" && (
        <label className="flex flex-col gap-1 font-semibold">
          Signed by
          <select {...r("role")} className={INPUT}>
            {ROLES.map((x) => (
              <option key={x} value={x}>
                {x.replace("_", " ")}
              </option>
            ))}
          </select>
        </label>
      )}
      {kind === "caution" && (
        <label className="flex flex-col gap-1 font-semibold">
          Topic
          <select {...r("topic")} className={INPUT}>
            {TOPICS.map((x) => (
              <option key={x} value={x}>
                {x.replace("_", " ")}
              </option>
            ))}
          </select>
        </label>
      )}
    </div>
  );
}
