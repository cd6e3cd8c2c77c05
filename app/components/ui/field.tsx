// Form fields: a label, an optional hint, the control, and the list of its errors.
// The control points at the hint and (when invalid) at the errors through
// aria-describedby; Conform's get*Props supply the ids and aria-invalid.
import {
  getInputProps,
  getSelectProps,
  getTextareaProps,
  type FieldMetadata,
} from "@conform-to/react";

// Conform's metadata for one field, whatever the value's type.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = FieldMetadata<any, any, any>;

const CONTROL =
  "mt-1 block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal";

/** The classes of a text box, select or text area: red border while it has errors. */
export function controlClass(errors: unknown, extra = ""): string {
  return `${CONTROL} ${errors ? "border-red" : "border-steel-300"} ${extra}`.trim();
}

export function hintId(field: { id: string }, hint: unknown): string | undefined {
  return hint ? `${field.id}-hint` : undefined;
}

export function FieldErrors({ id, errors }: { id: string; errors?: string[] | null }) {
  return (
    <div id={id} aria-live="polite">
      {errors?.map((e) => (
        <p key={e} className="mt-1 text-sm font-medium text-red-text">
          {e}
        </p>
      ))}
    </div>
  );
}

/** Label, hint, any control, errors. `labelHidden` keeps the label for screen readers only. */
export function Field({
  id,
  label,
  hint,
  errorId,
  errors,
  labelHidden,
  children,
}: {
  id: string;
  label: React.ReactNode;
  hint?: React.ReactNode;
  errorId: string;
  errors?: string[] | null;
  labelHidden?: boolean;
  children: React.ReactNode;
}) {
  return (
    <div>
      <label
        htmlFor={id}
        className={labelHidden ? "sr-only" : "block text-sm font-semibold text-graphite"}
      >
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="mt-0.5 text-sm text-steel-700">
          {hint}
        </p>
      ) : null}
      {children}
      <FieldErrors id={errorId} errors={errors} />
    </div>
  );
}

type Common = {
  field: AnyField;
  label: React.ReactNode;
  hint?: React.ReactNode;
  labelHidden?: boolean;
};

function shell({ field, label, hint, labelHidden }: Common, control: React.ReactNode) {
  return (
    <Field
      id={field.id}
      label={label}
      hint={hint}
      errorId={field.errorId}
      errors={field.errors}
      labelHidden={labelHidden}
    >
      {control}
    </Field>
  );
}

export function TextField({
  type = "text",
  mono,
  step,
  autoComplete,
  autoFocus,
  ...common
}: Common & {
  type?: "text" | "email" | "password" | "number";
  mono?: boolean;
  step?: string;
  autoComplete?: string;
  autoFocus?: boolean;
}) {
  const props = getInputProps(common.field, {
    type,
    ariaDescribedBy: hintId(common.field, common.hint),
  });
  const number = type === "number";
  return shell(
    common,
    <input
      {...props}
      key={props.key}
      step={step}
      inputMode={number ? "decimal" : undefined}
      autoComplete={autoComplete}
      autoFocus={autoFocus}
      className={controlClass(
        common.field.errors,
        `${mono ? "font-mono" : ""} ${number ? "num" : ""}`,
      )}
    />,
  );
}

export type Option = { value: string; label: string };

export function SelectField({
  options,
  placeholder,
  onChange,
  ...common
}: Common & {
  options: readonly Option[];
  placeholder?: string;
  onChange?: (value: string) => void;
}) {
  const props = getSelectProps(common.field, {
    ariaDescribedBy: hintId(common.field, common.hint),
  });
  return shell(
    common,
    <select
      {...props}
      key={props.key}
      onChange={onChange ? (e) => onChange(e.target.value) : undefined}
      className={controlClass(common.field.errors)}
    >
      {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </select>,
  );
}

export function TextAreaField({
  rows = 3,
  mono,
  ...common
}: Common & { rows?: number; mono?: boolean }) {
  const props = getTextareaProps(common.field, {
    ariaDescribedBy: hintId(common.field, common.hint),
  });
  return shell(
    common,
    <textarea
      {...props}
      key={props.key}
      rows={rows}
      spellCheck={mono ? false : undefined}
      className={controlClass(common.field.errors, mono ? "font-mono text-sm" : "")}
    />,
  );
}

export function CheckboxField({
  field,
  label,
  className = "",
}: {
  field: AnyField;
  label: React.ReactNode;
  className?: string;
}) {
  const props = getInputProps(field, { type: "checkbox" });
  return (
    <div className={`flex items-center gap-2 ${className}`}>
      <input {...props} key={props.key} className="h-5 w-5 accent-teal" />
      <label htmlFor={field.id} className="font-semibold text-graphite">
        {label}
      </label>
    </div>
  );
}
