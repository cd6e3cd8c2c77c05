// Messages above a form or a page: the server's refusal, a success, a caution.

/**
 * The form-level errors of the server's last answer. Shown until the next answer, so a
 * client-side revalidation on input does not pull the message away (and the layout with it).
 */
export function serverFormErrors(
  result: { error?: Record<string, string[] | null> | null } | undefined,
): string[] | undefined {
  return result?.error?.[""] ?? undefined;
}

/** The form's own errors while the browser has any, else the server's last ones. */
export function formErrorsOf(
  form: { errors?: string[] },
  result: Parameters<typeof serverFormErrors>[0],
): string[] | undefined {
  return form.errors?.length ? form.errors : serverFormErrors(result);
}

export function FormAlert({ id, errors }: { id: string; errors?: string[] }) {
  if (!errors?.length) return <div id={id} />;
  return (
    <div
      id={id}
      role="alert"
      className="rounded border border-red bg-white px-3 py-2 text-sm font-medium text-red-text"
    >
      {errors.map((e) => (
        <p key={e}>{e}</p>
      ))}
    </div>
  );
}

export function Notice({
  children,
  className = "",
}: {
  children: React.ReactNode;
  className?: string;
}) {
  return (
    <div
      role="status"
      className={`rounded border border-green bg-white px-3 py-2 text-sm font-medium text-green-text ${className}`}
    >
      {children}
    </div>
  );
}

/** A caution in amber: what the staff must keep in mind (not an error). */
export function Caution({
  children,
  className = "",
}: {
  children: React.ReactNode;
  className?: string;
}) {
  return (
    <div
      className={`rounded border border-amber bg-white px-3 py-2 text-sm text-amber-text ${className}`}
    >
      {children}
    </div>
  );
}
