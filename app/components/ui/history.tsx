// A record's versions, newest first: who changed it and when, and what changed
// from the version before.
import { When } from "./when";

export type HistoryChange = { label: string; before: string; after: string; mono?: boolean };

type EntryProps = {
  version: number;
  changedAt: string;
  changedBy: string | null;
  badge?: React.ReactNode;
  note?: string;
  /** null for the first version */
  previousVersion: number | null;
  changes: HistoryChange[];
  children?: React.ReactNode;
};

/** The versions, newest first; `entry` tells what to show of one, given the one before it. */
export function HistoryList<T extends { version: number }>({
  versions,
  entry,
}: {
  versions: readonly T[];
  entry: (v: T, prev: T | undefined) => Omit<EntryProps, "version" | "previousVersion">;
}) {
  return (
    <ol className="space-y-3">
      {versions.map((v, i) => {
        const prev = versions[i + 1];
        return (
          <HistoryEntry
            key={v.version}
            version={v.version}
            previousVersion={prev?.version ?? null}
            {...entry(v, prev)}
          />
        );
      })}
    </ol>
  );
}

function HistoryEntry({
  version,
  changedAt,
  changedBy,
  badge,
  note,
  previousVersion,
  changes,
  children,
}: EntryProps) {
  return (
    <li className="rounded border border-steel-200 bg-white p-3 text-sm">
      <p className="flex flex-wrap items-center gap-2">
        <span className="num font-semibold text-ink">v{version}</span>
        {badge}
        <span className="text-steel-700">
          <When at={changedAt} time />
          {changedBy ? ` · ${changedBy}` : ""}
        </span>
      </p>
      {note ? <p className="mt-1 text-graphite">{note}</p> : null}
      {children}
      {previousVersion === null ? (
        <p className="mt-2 text-steel-700">First version.</p>
      ) : changes.length ? (
        <div className="mt-2 border-t border-steel-100 pt-2">
          <p className="font-semibold text-graphite">Changed from v{previousVersion}:</p>
          <ul className="mt-1 space-y-1">
            {changes.map((c) => (
              <li key={c.label}>
                <span className="font-medium text-graphite">{c.label}: </span>
                <del className={`break-all bg-steel-50 text-red-text ${c.mono ? "font-mono" : ""}`}>
                  {c.before}
                </del>{" "}
                →{" "}
                <ins
                  className={`break-all text-green-text no-underline ${c.mono ? "font-mono" : ""}`}
                >
                  {c.after}
                </ins>
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="mt-2 text-steel-700">Same as v{previousVersion}.</p>
      )}
    </li>
  );
}

/** The fields whose shown value differs between two versions. */
export function changesBetween<T>(
  prev: T | undefined,
  next: T,
  fields: readonly { label: string; show: (v: T) => string; mono?: boolean }[],
): HistoryChange[] {
  if (!prev) return [];
  return fields.flatMap((f) => {
    const before = f.show(prev);
    const after = f.show(next);
    return before === after ? [] : [{ label: f.label, before, after, mono: f.mono }];
  });
}
