// Form pieces shared by the sign-in, invite, reset and staff screens.
import { getInputProps, type FieldMetadata } from "@conform-to/react";

export function TextField({
  label,
  field,
  type = "text",
  hint,
  autoComplete,
  autoFocus,
}: {
  label: string;
  field: FieldMetadata<string>;
  type?: "text" | "email" | "password";
  hint?: string;
  autoComplete?: string;
  autoFocus?: boolean;
}) {
  const hintId = hint ? `${field.id}-hint` : undefined;
  const props = getInputProps(field, { type, ariaDescribedBy: hintId });
  return (
    <div>
      <label htmlFor={field.id} className="block text-sm font-semibold text-graphite">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="mt-0.5 text-sm text-steel-700">
          {hint}
        </p>
      ) : null}
      <input
        {...props}
        key={props.key}
        autoComplete={autoComplete}
        autoFocus={autoFocus}
        className={`mt-1 block w-full rounded border bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-teal ${
          field.errors ? "border-red" : "border-steel-300"
        }`}
      />
      <FieldErrors id={field.errorId} errors={field.errors} />
    </div>
  );
}

export function FieldErrors({ id, errors }: { id: string; errors?: string[] }) {
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

/**
 * The form-level errors of the server's last answer. Shown until the next answer, so a
 * client-side revalidation on blur does not pull the message away (and the layout with it).
 */
export function serverFormErrors(result: { error?: Record<string, string[] | null> | null } | undefined): string[] | undefined {
  return result?.error?.[""] ?? undefined;
}

export function FormAlert({ id, errors }: { id: string; errors?: string[] }) {
  if (!errors?.length) return <div id={id} />;
  return (
    <div id={id} role="alert" className="rounded border border-red bg-white px-3 py-2 text-sm font-medium text-red-text">
      {errors.map((e) => (
        <p key={e}>{e}</p>
      ))}
    </div>
  );
}

export function Notice({ children }: { children: React.ReactNode }) {
  return (
    <div role="status" className="rounded border border-green bg-white px-3 py-2 text-sm font-medium text-green-text">
      {children}
    </div>
  );
}

export function SubmitButton({ children, busy }: { children: React.ReactNode; busy?: boolean }) {
  return (
    <button
      type="submit"
      disabled={busy}
      className="w-full rounded bg-teal-dark px-4 py-2.5 font-semibold text-white hover:bg-ink disabled:opacity-60"
    >
      {children}
    </button>
  );
}

export function AuthCard({ title, lead, children }: { title: string; lead?: React.ReactNode; children: React.ReactNode }) {
  return (
    <main className="mx-auto max-w-md px-4 py-12">
      <div className="rounded-lg border border-steel-200 bg-white p-6 shadow-sm">
        <h1 className="text-2xl font-semibold text-ink">{title}</h1>
        {lead ? <div className="mt-1 text-steel-700">{lead}</div> : null}
        <div className="mt-6">{children}</div>
      </div>
    </main>
  );
}
