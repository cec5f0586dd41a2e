// Small form pieces shared by the entry screens: a labelled field row, a row of choice buttons
// (radio group), the <option> list of a select, a table header row and a notice listing problems.
// Sized for gloved hands (48 px targets) and read at arm's length (16 px or more).
import type { ReactNode } from "react";
import { Notice } from "./panel";

/** The class of a text input, select or textarea on the entry forms. */
export const INPUT_CLASS =
  "w-full rounded-xl border-2 border-line bg-bg px-4 py-2 text-lg text-ink focus:border-accent";

/** Label above the control, a hint below it. The control must carry the same id. */
export function FieldRow({
  id,
  label,
  hint,
  children,
}: {
  id: string;
  label: string;
  hint?: string | undefined;
  children: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {children}
      {hint && <p className="text-base text-muted">{hint}</p>}
    </div>
  );
}

export type Choice<T extends string = string> = { readonly value: T; readonly label: string };

/** The options of a select, from value/label pairs. */
export function OptionList({ options }: { options: readonly Choice[] }) {
  return (
    <>
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </>
  );
}

/** A row of buttons of which one is chosen (role="radiogroup"). */
export function ChoiceButtons<T extends string>({
  label,
  options,
  value,
  onChange,
  className = "flex gap-2",
}: {
  label: string;
  options: readonly Choice<T>[];
  value: T;
  onChange: (v: T) => void;
  className?: string;
}) {
  return (
    <div className={className} role="radiogroup" aria-label={label}>
      {options.map((o) => (
        <button
          key={o.value}
          type="button"
          role="radio"
          aria-checked={value === o.value}
          onClick={() => onChange(o.value)}
          className={`min-h-12 rounded-xl border-2 px-4 font-semibold ${value === o.value ? "border-accent bg-sunk" : "border-line"}`}
        >
          {o.label}
        </button>
      ))}
    </div>
  );
}

/** A table's header row; an empty-looking column gets its name for screen readers only. */
export function TableHead({
  columns,
  cell = "px-5 py-2",
}: {
  columns: readonly (string | { srOnly: string })[];
  cell?: string;
}) {
  return (
    <thead>
      <tr className="text-base text-muted">
        {columns.map((c) => (
          <th key={typeof c === "string" ? c : c.srOnly} className={cell}>
            {typeof c === "string" ? c : <span className="sr-only">{c.srOnly}</span>}
          </th>
        ))}
      </tr>
    </thead>
  );
}

/** The outcome of a save: a title and, when the server named them, the problems one per line. */
export function ProblemNotice({
  tone,
  title,
  problems,
}: {
  tone: "ok" | "danger" | "warn";
  title: string;
  problems?: readonly string[] | undefined;
}) {
  return (
    <Notice tone={tone} role={tone === "danger" ? "alert" : "status"} title={title}>
      {problems?.length ? (
        <ul className="ml-5 list-disc">
          {problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      ) : null}
    </Notice>
  );
}

/** A labelled decimal input (figures in the number font); the value stays text until saved. */
export function NumberField({
  id,
  label,
  hint,
  value,
  onChange,
  placeholder,
}: {
  id: string;
  label: string;
  hint?: string | undefined;
  value: string;
  onChange: (v: string) => void;
  placeholder?: string | undefined;
}) {
  return (
    <FieldRow id={id} label={label} hint={hint}>
      <input
        id={id}
        inputMode="decimal"
        className={`${INPUT_CLASS} num`}
        value={value}
        placeholder={placeholder}
        onChange={(e) => onChange(e.target.value)}
      />
    </FieldRow>
  );
}

/** A bordered group of controls under a legend (people present, safety checks, per cryostat). */
export function FieldGroup({ legend, children }: { legend: string; children: ReactNode }) {
  return (
    <fieldset className="rounded-xl border-2 border-line p-3">
      <legend className="px-1 font-semibold">{legend}</legend>
      {children}
    </fieldset>
  );
}
