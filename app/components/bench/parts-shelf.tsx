// The parts shelf: search the active catalog as you type (debounced, from the JSON
// parts route) and drag a card onto a slot — with the mouse, a finger or the keyboard.
import { useDraggable } from "@dnd-kit/core";
import { useEffect, useId, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { BenchPart } from "~/lib/bench/spec";
import { formatMoney } from "~/lib/format";
import { categoryLabel } from "~/lib/format/labels";
import { SLOTS } from "~/lib/packages/slots";

// only parts a slot of this bench takes; the rest of the catalog waits for its slots
const SLOT_CATEGORIES: ReadonlySet<string> = new Set(SLOTS.map((s) => s.category));

const DEBOUNCE_MS = 200;

export function PartsShelf({
  onParts,
  canEdit,
}: {
  onParts: (parts: BenchPart[]) => void;
  canEdit: boolean;
}) {
  const fetcher = useFetcher<{ parts: BenchPart[] }>();
  const [q, setQ] = useState("");
  const [category, setCategory] = useState("");
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const searchId = useId();
  const load = fetcher.load;

  useEffect(() => {
    clearTimeout(timer.current);
    timer.current = setTimeout(
      () => load(`/api/parts?${new URLSearchParams({ q, category })}`),
      q ? DEBOUNCE_MS : 0,
    );
    return () => clearTimeout(timer.current);
  }, [q, category, load]);

  const found = fetcher.data?.parts ?? [];
  const parts = found.filter((p) => SLOT_CATEGORIES.has(p.category));
  const others = found.length - parts.length;
  useEffect(() => {
    if (fetcher.data?.parts) onParts(fetcher.data.parts);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [fetcher.data]);

  const categories = SLOTS.map((s) => ({ slug: s.category, label: s.label }));
  return (
    <section aria-labelledby={`${searchId}-h`} className="flex flex-col gap-2">
      <h2
        id={`${searchId}-h`}
        className="text-sm font-semibold uppercase tracking-wider text-steel-700"
      >
        Parts shelf
      </h2>
      <div className="flex flex-col gap-1">
        <label htmlFor={searchId} className="sr-only">
          Search parts
        </label>
        <input
          id={searchId}
          type="search"
          value={q}
          onChange={(e) => setQ(e.target.value)}
          placeholder="Search number, name, tag…"
          title="Search by part number, name, maker or tag"
          className="w-full rounded border border-steel-300 bg-white px-2 py-1 text-sm"
        />
        <label htmlFor={`${searchId}-cat`} className="sr-only">
          Category
        </label>
        <select
          id={`${searchId}-cat`}
          value={category}
          onChange={(e) => setCategory(e.target.value)}
          className="w-full rounded border border-steel-300 bg-white px-1 py-1 text-sm"
        >
          <option value="">All categories</option>
          {categories.map((c) => (
            <option key={c.slug} value={c.slug}>
              {c.label}
            </option>
          ))}
        </select>
      </div>
      <p className="text-xs text-steel-700" aria-live="polite">
        {fetcher.state === "loading"
          ? "Searching…"
          : `${parts.length} part${parts.length === 1 ? "" : "s"} for this bench's slots`}
        {others > 0 && fetcher.state !== "loading"
          ? ` · ${others} more in the catalog fit no slot here yet`
          : ""}
        {canEdit && parts.length > 0
          ? " · drag a card onto its slot, or focus it and press Space, an arrow, then Space"
          : ""}
      </p>
      {parts.length === 0 && fetcher.state === "idle" && fetcher.data ? (
        <p className="rounded border border-dashed border-steel-300 bg-white p-2 text-sm text-steel-700">
          {q || category
            ? `Nothing matches${q ? ` "${q}"` : ""}${category ? ` in ${categoryLabel(category)}` : ""}. Try part of the number (e.g. the maker's prefix), a shorter word, or "All categories".`
            : "The catalog has no part for these slots yet. Add parts on the Parts page."}
        </p>
      ) : null}
      <ul
        className="flex max-h-[70vh] flex-col gap-1.5 overflow-y-auto pr-1"
        data-testid="shelf-list"
      >
        {parts.map((p) => (
          <li key={p.id}>
            <PartCard part={p} canEdit={canEdit} />
          </li>
        ))}
      </ul>
    </section>
  );
}

export function PartCard({ part, canEdit }: { part: BenchPart; canEdit: boolean }) {
  const { attributes, listeners, setNodeRef, isDragging } = useDraggable({
    id: `part-${part.id}`,
    data: { part },
    disabled: !canEdit,
  });
  const category = categoryLabel(part.category);
  return (
    <div
      ref={setNodeRef}
      {...listeners}
      {...attributes}
      aria-label={`${part.name}, ${part.partNumber}, ${category}`}
      data-testid={`part-${part.partNumber}`}
      className={`cursor-grab touch-none select-none rounded border border-steel-200 bg-white px-2 py-1.5 text-sm shadow-sm hover:border-teal ${isDragging ? "opacity-40" : ""}`}
    >
      <PartCardBody part={part} category={category} />
    </div>
  );
}

export function PartCardBody({ part, category }: { part: BenchPart; category: string }) {
  return (
    <>
      <div className="flex items-baseline justify-between gap-2">
        <span className="font-medium text-ink">{part.name}</span>
        {part.priceCents != null ? (
          <span className="num text-xs text-steel-700">{formatMoney(part.priceCents)}</span>
        ) : null}
      </div>
      <div className="flex flex-wrap gap-x-2 text-xs text-steel-700">
        <span className="num">{part.partNumber}</span>
        <span>{category}</span>
        <span>{part.maker}</span>
        {part.stock ? <span className="rounded bg-steel-100 px-1">stock</span> : null}
      </div>
    </>
  );
}
