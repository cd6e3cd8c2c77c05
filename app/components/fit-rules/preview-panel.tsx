import type { PreviewEntry, PreviewResult } from "~/lib/fit-rules/rules.server";

function Values({ values }: { values: Record<string, unknown> }) {
  const entries = Object.entries(values);
  if (!entries.length) return null;
  return (
    <span className="num text-steel-700">
      {" "}
      ·{" "}
      {entries
        .slice(0, 6)
        .map(
          ([k, v]) =>
            `${k} = ${typeof v === "number" ? Number(v.toPrecision(6)) : v === null ? "—" : String(v)}`,
        )
        .join(", ")}
    </span>
  );
}

function Group({ title, tone, items }: { title: string; tone: string; items: PreviewEntry[] }) {
  return (
    <div>
      <h3 className={`font-semibold ${tone}`}>
        {title} <span className="num">({items.length})</span>
      </h3>
      {items.length ? (
        <ul className="mt-1 space-y-0.5">
          {items.slice(0, 50).map((p) => (
            <li key={p.packageId}>
              <a className="font-medium text-ink underline" href={`/packages/${p.packageId}`}>
                {p.name}
              </a>
              {p.error ? (
                <span className="text-amber-text"> · {p.error}</span>
              ) : (
                <Values values={p.triggeredBy} />
              )}
            </li>
          ))}
          {items.length > 50 ? (
            <li className="text-steel-700">and {items.length - 50} more</li>
          ) : null}
        </ul>
      ) : (
        <p className="text-steel-700">None.</p>
      )}
    </div>
  );
}

export function PreviewPanel({ preview }: { preview: PreviewResult }) {
  if (!preview.ok) return null;
  return (
    <section
      aria-labelledby="preview-h"
      aria-live="polite"
      className="mt-4 rounded border border-teal bg-white p-4 text-sm"
    >
      <h2 id="preview-h" className="text-lg font-semibold text-ink">
        Preview against <span className="num">{preview.checked}</span> saved package
        {preview.checked === 1 ? "" : "s"}
      </h2>
      <p className="text-steel-700">Nothing is saved yet. Check the lists, then save.</p>
      <div className="mt-3 grid gap-4 sm:grid-cols-2">
        <Group title="Would start flagging" tone="text-red-text" items={preview.willFlag} />
        <Group title="Would stop flagging" tone="text-green-text" items={preview.stopsFlagging} />
        <Group title="Flagged before and after" tone="text-ink" items={preview.stillFlags} />
        <Group title="Could not be checked" tone="text-amber-text" items={preview.cannotCheck} />
      </div>
    </section>
  );
}
