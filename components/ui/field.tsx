// A labelled form field with its error message, usable with react-hook-form's register().
import { forwardRef, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";
import { OptionList } from "./form";

const INPUT =
  "w-full rounded-xl border-2 border-line bg-bg px-4 py-2 text-lg text-ink placeholder:text-muted focus:border-accent";

type Common = { label: string; error?: string; hint?: string };

/** Label above, hint or error below; the control in between gets the ids it needs. */
function FieldFrame({
  id,
  label,
  error,
  hint,
  className,
  children,
}: Common & { id?: string; className: string; children: ReactNode }) {
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {children}
      {hint && !error && <p className="text-base text-muted">{hint}</p>}
      {error && (
        <p id={`${id}-error`} className="text-base font-semibold text-danger">
          {error}
        </p>
      )}
    </div>
  );
}

export const TextField = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement> & Common>(
  function TextField({ label, error, hint, id, className = "", ...rest }, ref) {
    const fid = id ?? rest.name;
    return (
      <FieldFrame id={fid} label={label} error={error} hint={hint} className={className}>
        <input
          ref={ref}
          id={fid}
          aria-invalid={Boolean(error)}
          aria-describedby={error ? `${fid}-error` : undefined}
          className={INPUT}
          {...rest}
        />
      </FieldFrame>
    );
  },
);

export const SelectField = forwardRef<
  HTMLSelectElement,
  SelectHTMLAttributes<HTMLSelectElement> & Common & { options: { value: string; label: string }[] }
>(function SelectField({ label, error, hint, id, options, className = "", ...rest }, ref) {
  const fid = id ?? rest.name;
  return (
    <FieldFrame id={fid} label={label} error={error} hint={hint} className={className}>
      <select
        ref={ref}
        id={fid}
        aria-invalid={Boolean(error)}
        aria-describedby={error ? `${fid}-error` : undefined}
        className={INPUT}
        {...rest}
      >
        <OptionList options={options} />
      </select>
    </FieldFrame>
  );
});
