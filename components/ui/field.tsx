import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from "react";

const CONTROL =
  "block w-full min-h-11 rounded-md border bg-paper-raised px-3 text-base text-ink placeholder:text-ink-faint focus:border-kerf focus:outline-none focus:ring-2 focus:ring-kerf";

interface FieldProps {
  label: string;
  name: string;
  error?: string;
  hint?: ReactNode;
  children?: ReactNode;
}

/** A labelled control with its hint and its error message, linked for screen readers. */
export function Field({ label, name, error, hint, children }: FieldProps) {
  return (
    <div className="space-y-1">
      <label htmlFor={name} className="block text-sm font-medium text-ink-soft">
        {label}
      </label>
      {children}
      {hint && !error && <p className="text-xs text-ink-faint">{hint}</p>}
      {error && (
        <p id={`${name}-error`} className="text-sm text-ember">
          {error}
        </p>
      )}
    </div>
  );
}

export function Input({ error, ...rest }: InputHTMLAttributes<HTMLInputElement> & { error?: string }) {
  return (
    <input
      id={rest.id ?? rest.name}
      aria-invalid={error ? true : undefined}
      aria-describedby={error ? `${rest.id ?? rest.name}-error` : undefined}
      className={`${CONTROL} ${error ? "border-ember" : "border-bead-strong"}`}
      {...rest}
    />
  );
}

export function Select({ error, children, ...rest }: SelectHTMLAttributes<HTMLSelectElement> & { error?: string }) {
  return (
    <select
      id={rest.id ?? rest.name}
      aria-invalid={error ? true : undefined}
      aria-describedby={error ? `${rest.id ?? rest.name}-error` : undefined}
      className={`${CONTROL} ${error ? "border-ember" : "border-bead-strong"}`}
      {...rest}
    >
      {children}
    </select>
  );
}

/** The id of a field's error message, for controls laid out without Field (rows of a table). */
export const errorId = (path: string) => `${path.replace(/[^A-Za-z0-9_-]/g, "-")}-error`;

/** aria-invalid and aria-describedby for a control whose error, if any, is shown with id errorId(path). */
export function tiedError(fields: Record<string, string | undefined>, path: string) {
  return fields[path] ? { "aria-invalid": true as const, "aria-describedby": errorId(path) } : {};
}

interface ChoicesProps<K extends string> {
  legend: string;
  name: string;
  options: readonly (readonly [K, ReactNode])[];
  value: K;
  onChange: (value: K) => void;
  hint?: ReactNode;
  className?: string;
}

/**
 * A row of radio buttons, each a touch-sized labelled pill, under a legend; the chosen one is marked.
 *
 *   <Choices legend="Parts" name="joined" options={[["0", "Each letter a part"], ["1", "One joined part"]]}
 *     value={v.joined} onChange={(joined) => setV({ ...v, joined })} />
 */
export function Choices<K extends string>({
  legend,
  name,
  options,
  value,
  onChange,
  hint,
  className,
}: ChoicesProps<K>) {
  return (
    <fieldset className={className}>
      <legend className="text-sm font-medium text-ink-soft">{legend}</legend>
      <div className="mt-1 flex flex-wrap gap-2">
        {options.map(([k, label]) => (
          <label
            key={k}
            className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-md border px-3 text-sm ${value === k ? "border-kerf bg-kerf-light" : "border-bead-strong bg-paper-raised"}`}
          >
            <input
              type="radio"
              name={name}
              value={k}
              checked={value === k}
              onChange={() => onChange(k)}
              className="accent-kerf"
            />
            {label}
          </label>
        ))}
      </div>
      {hint && <p className="mt-1 text-xs text-ink-faint">{hint}</p>}
    </fieldset>
  );
}
