import { requireIdParam } from "~/lib/http/ids";
import {
  DndContext,
  DragOverlay,
  KeyboardSensor,
  MouseSensor,
  TouchSensor,
  useSensor,
  useSensors,
  type Announcements,
  type DragEndEvent,
  type KeyboardCoordinateGetter,
} from "@dnd-kit/core";
import { useState } from "react";
import { data, Link, useFetcher, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/packages.$id.bench";
import { requireRole } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { can } from "~/lib/auth/permissions";
import { EDITABLE_STATUSES, resolveFields, toCalcInput, type BenchPart } from "~/lib/bench/spec";
import { runBenchAction } from "~/lib/bench/action.server";
import { useBenchQueue } from "~/lib/bench/queue";
import { getBenchState, getPackageHeader, slotOptions } from "~/lib/packages/store.server";
import { getUnits, setUnits } from "~/lib/units-pref.server";
import { SLOTS, SLOT_BY_KEY } from "~/lib/packages/slots";
import { inToMm } from "../../calc";
import { EngineSection } from "~/components/bench/engine-section";
import { PartCardBody, PartsShelf } from "~/components/bench/parts-shelf";
import { ResultsPanel } from "~/components/bench/results-panel";
import { SlotCard, type SlotActions } from "~/components/bench/slot-card";
import { PackageNumbers } from "~/components/bench/package-numbers";
import { StaleNotice } from "~/components/bench/stale-notice";
import { BenchSummary } from "~/components/bench/bench-summary";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireRole(request, "owner", "builder", "service_writer");
  const db = getDb();
  const id = requireIdParam(params);
  const header = Number.isInteger(id) ? await getPackageHeader(db, id) : null;
  if (!header) throw data("No package with this number.", { status: 404 });
  const prices = can(user.role, "prices:read");
  const [state, options, units] = await Promise.all([
    getBenchState(db, id, prices),
    slotOptions(db, prices),
    getUnits(db, user.id),
  ]);
  if (!state) throw data("No package with this number.", { status: 404 });
  const canEdit = can(user.role, "packages:edit") && EDITABLE_STATUSES.includes(header.status);
  return { header, state, options, units, canEdit };
}

export async function action({ request, params }: Route.ActionArgs) {
  const form = await request.formData();
  if (form.get("intent") === "set-units") {
    const user = await requireRole(request, "owner", "builder", "service_writer");
    const units = form.get("units") === "metric" ? "metric" : "inch";
    await setUnits(getDb(), user.id, units);
    return data({ ok: true as const, units });
  }
  const user = await requireRole(request, "owner", "builder");
  return runBenchAction(getDb(), user, requireIdParam(params), form);
}

export function shouldRevalidate({
  formMethod,
  defaultShouldRevalidate,
}: ShouldRevalidateFunctionArgs) {
  // the action answers with the whole bench state; reloading it would only cost time
  return formMethod === "POST" ? false : defaultShouldRevalidate;
}

/**
 * Arrow keys jump a lifted card between the slots it fits, in reading order. dnd-kit
 * measures the slots in an effect after the lift; an arrow pressed before that (a quick
 * keyboard user, a slow device) measures them here, so it is never silently ignored.
 */
const slotJumps: KeyboardCoordinateGetter = (event, { currentCoordinates, context }) => {
  const arrows = ["ArrowDown", "ArrowRight", "ArrowUp", "ArrowLeft"];
  if (!arrows.includes(event.code)) return undefined;
  event.preventDefault();
  const category = (context.active?.data.current?.part as BenchPart | undefined)?.category;
  const targets = [...context.droppableContainers.values()]
    .filter((c) => !c.disabled && (!category || c.data.current?.category === category))
    .flatMap((c) => {
      const rect = c.rect.current ?? c.node.current?.getBoundingClientRect() ?? null;
      return rect ? [{ id: c.id, rect }] : [];
    })
    .sort((a, b) => a.rect.top - b.rect.top || a.rect.left - b.rect.left);
  const lifted = context.collisionRect ?? context.activeNode?.getBoundingClientRect() ?? null;
  if (targets.length === 0 || !lifted) return currentCoordinates;
  const overId = context.over?.id;
  const current = overId ? targets.findIndex((t) => t.id === overId) : -1;
  const forward = event.code === "ArrowDown" || event.code === "ArrowRight";
  const next = targets[(current + (forward ? 1 : -1) + targets.length) % targets.length]!.rect;
  return {
    x: next.left + next.width / 2 - lifted.width / 2,
    y: next.top + next.height / 2 - lifted.height / 2,
  };
};

/**
 * dnd-kit's keyboard sensor starts listening for keys in a timer after the lift (so that
 * the Space that lifted the card does not also drop it). A browser answers key presses
 * before timers, so an arrow pressed right after "Picked up" was lost while the page was
 * busy. This sensor hears every key from the moment of the lift: until dnd-kit's own
 * listener is attached, a capturing listener hands the keys to the sensor, and keeps them
 * from reaching dnd-kit's listener a second time.
 */
class PromptKeyboardSensor extends KeyboardSensor {
  constructor(props: ConstructorParameters<typeof KeyboardSensor>[0]) {
    super(props);
    const lifting = props.event;
    const handle = (this as unknown as { handleKeyDown: (e: Event) => void }).handleKeyDown;
    const doc = (lifting.target as Node | null)?.ownerDocument ?? document;
    const early = (e: KeyboardEvent) => {
      if (e === lifting) return;
      e.stopImmediatePropagation();
      handle(e);
      if (["Space", "Enter", "Escape"].includes(e.code)) stop();
    };
    const stop = () => doc.removeEventListener("keydown", early, true);
    doc.addEventListener("keydown", early, true);
    // queued after dnd-kit's own timer, so its listener is attached by then
    setTimeout(stop);
  }
}

export default function Bench({ loaderData }: Route.ComponentProps) {
  const { header, canEdit } = loaderData;
  const bench = useBenchQueue(loaderData.state, Object.values(loaderData.options).flat());
  const [units, setUnitsState] = useState(loaderData.units);
  const unitsFetcher = useFetcher();
  const [dragging, setDragging] = useState<BenchPart | null>(null);
  const sensors = useSensors(
    useSensor(MouseSensor, { activationConstraint: { distance: 4 } }),
    useSensor(TouchSensor, { activationConstraint: { delay: 150, tolerance: 6 } }),
    useSensor(PromptKeyboardSensor, { coordinateGetter: slotJumps }),
  );
  const fields = resolveFields(bench.spec, bench.parts);

  const post = (
    fields: Record<string, string>,
    intent: Parameters<typeof bench.submit>[0]["intent"],
    key: string,
  ) => bench.submit({ fields, intent, key });
  const actions: SlotActions = {
    pick: (slot, partId) =>
      post(
        { intent: "set-part", slot, partId: String(partId) },
        { intent: "set-part", slot, partId },
        slot,
      ),
    clear: (slot) => post({ intent: "clear-slot", slot }, { intent: "clear-slot", slot }, slot),
    measure: (slot, field, text) => {
      const isLength = !field.endsWith("Cc") && field !== "intakeClosesAbdcDeg";
      const unit =
        isLength && units === "inch" ? "in" : isLength ? "mm" : field.endsWith("Cc") ? "cc" : "deg";
      const n = Number(text.trim().replace(",", "."));
      const value = unit === "in" ? inToMm(n) : n;
      const ok = text.trim() !== "" && Number.isFinite(n);
      post(
        { intent: "set-measured", slot, field, value: text, unit },
        ok ? { intent: "set-measured", slot, field, value } : null,
        `${slot}.${field}`,
      );
    },
    revert: (slot, field) =>
      post(
        { intent: "revert-measured", slot, field },
        { intent: "revert-measured", slot, field },
        `${slot}.${field}`,
      ),
  };

  const partName = (id: string | number | undefined) => {
    const p = typeof id === "string" ? bench.parts.get(Number(id.replace("part-", ""))) : undefined;
    return p ? `${p.name} (${p.partNumber})` : "the part";
  };
  const slotName = (id: string | number | undefined) =>
    SLOT_BY_KEY[String(id ?? "").replace("slot-", "")]?.label.toLowerCase() ?? "nowhere";
  const fitsSlot = (activeId: string | number, overId: string | number) => {
    const p = bench.parts.get(Number(String(activeId).replace("part-", "")));
    return p?.category === SLOT_BY_KEY[String(overId).replace("slot-", "")]?.category;
  };
  const announcements: Announcements = {
    onDragStart: ({ active }) =>
      `Picked up ${partName(active.id)}. Use the arrow keys to move to a slot it fits, Space to drop, Escape to cancel.`,
    onDragOver: ({ active, over }) =>
      over
        ? `${partName(active.id)} is over the ${slotName(over.id)} slot${fitsSlot(active.id, over.id) ? "" : ", which it does not fit"}.`
        : `${partName(active.id)} is not over a slot.`,
    onDragEnd: ({ active, over }) =>
      over && fitsSlot(active.id, over.id)
        ? `${partName(active.id)} placed in the ${slotName(over.id)} slot. Figures updated.`
        : `${partName(active.id)} was dropped outside a slot it fits; nothing changed.`,
    onDragCancel: ({ active }) => `Moving ${partName(active.id)} was cancelled; nothing changed.`,
  };
  const onDragEnd = ({ active, over }: DragEndEvent) => {
    setDragging(null);
    const part = active.data.current?.part as BenchPart | undefined;
    const slot = over?.data.current?.slot as string | undefined;
    if (!part || !slot || SLOT_BY_KEY[slot]?.category !== part.category) return;
    actions.pick(slot, part.id);
  };
  const changeUnits = (u: "inch" | "metric") => {
    setUnitsState(u);
    unitsFetcher.submit({ intent: "set-units", units: u }, { method: "post" });
  };
  const slotCard = (key: string) => {
    const slot = SLOT_BY_KEY[key]!;
    const fill = bench.spec.slots[key]!;
    return (
      <SlotCard
        key={key}
        slot={slot}
        fill={fill}
        part={fill.partId != null ? bench.parts.get(fill.partId) : undefined}
        options={loaderData.options[key] ?? []}
        fields={fields}
        units={units}
        errors={bench.errors}
        canEdit={canEdit}
        actions={actions}
        dragCategory={dragging?.category ?? null}
      />
    );
  };

  return (
    <main className="mx-auto max-w-[1600px] px-3 py-4">
      <div className="mb-3 flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h1 className="text-2xl font-semibold text-ink">Spec bench · {header.name}</h1>
        <p className="text-sm text-steel-700">
          {header.isTemplate
            ? "Shop template"
            : `${header.customerName ?? ""} · ${header.bikeLabel ?? ""}`}{" "}
          · {header.status.replace("_", " ")} ·{" "}
          <span className="num" data-testid="revision">
            revision {bench.base.revision}
          </span>
          {bench.pending ? (
            <span className="ml-2 text-teal-text">saving…</span>
          ) : (
            <span className="ml-2">saved by {bench.base.savedBy ?? "—"}</span>
          )}
        </p>
        <Link to={`/packages/${header.id}`} className="text-sm text-teal-text underline">
          Overview and revisions
        </Link>
      </div>
      {!canEdit ? (
        <p className="mb-3 rounded border border-steel-200 bg-white p-2 text-sm text-steel-700">
          {EDITABLE_STATUSES.includes(header.status)
            ? "Your role reads packages; builders change them."
            : "This package's spec is locked at its status; move it back to draft to change it."}
        </p>
      ) : null}
      {bench.errors.form ? (
        <p
          role="alert"
          className="mb-3 rounded border border-red bg-white p-2 text-sm text-red-text"
        >
          {bench.errors.form.join(" ")}
        </p>
      ) : null}
      {bench.conflict ? (
        <StaleNotice
          info={bench.conflict.info}
          mine={bench.conflict.mine.length}
          onApply={bench.applyMineOnTop}
          onDiscard={bench.discardMine}
        />
      ) : null}
      <DndContext
        sensors={sensors}
        accessibility={{ announcements }}
        onDragStart={({ active }) => setDragging((active.data.current?.part as BenchPart) ?? null)}
        onDragCancel={() => setDragging(null)}
        onDragEnd={onDragEnd}
      >
        <BenchSummary
          computation={bench.computation}
          findings={bench.base.findings}
          units={units}
          pending={bench.pending}
        />
        {/* on a phone: engine slots and numbers, then the results and findings, then the chassis,
            then the shelf (every slot also has its pick-list); the middle column's parts join
            the one-column grid there (display: contents) so the results can sit between them */}
        <div className="grid grid-cols-1 gap-4 lg:grid-cols-[280px_minmax(0,1fr)_360px]">
          <div className="order-5 lg:order-none">
            <PartsShelf onParts={bench.remember} canEdit={canEdit} />
          </div>
          <div className="contents lg:flex lg:flex-col lg:gap-4">
            <section
              aria-label="Engine slots"
              className="order-1 grid grid-cols-1 gap-2 rounded border border-steel-200 bg-steel-100 p-2 sm:grid-cols-[minmax(0,1fr)_auto_minmax(0,1fr)] lg:order-none"
            >
              <div className="flex flex-col gap-2">
                {["head", "gasket", "cylinder", "rod"].map(slotCard)}
              </div>
              <div className="order-first flex justify-center sm:order-none">
                <EngineSection
                  fields={fields}
                  deckClearanceMm={bench.spec.deckClearanceMm}
                  units={units}
                />
              </div>
              <div className="flex flex-col gap-2">
                {["cam", "springs", "piston", "flywheel"].map(slotCard)}
              </div>
            </section>
            <div className="order-2 lg:order-none">
              <PackageNumbers
                spec={bench.spec}
                units={units}
                errors={bench.errors}
                canEdit={canEdit}
                submit={bench.submit}
              />
            </div>
            <section
              aria-label="Chassis slots"
              className="order-4 rounded border border-steel-200 bg-white p-2 lg:order-none"
            >
              <h2 className="mb-2 text-sm font-semibold uppercase tracking-wider text-steel-700">
                Chassis
              </h2>
              <div className="grid grid-cols-1 gap-2 sm:grid-cols-2 xl:grid-cols-4">
                {SLOTS.filter((s) => s.group === "chassis").map((s) => slotCard(s.key))}
              </div>
            </section>
          </div>
          <div className="order-3 lg:order-none">
            <ResultsPanel
              computation={bench.computation}
              input={toCalcInput(bench.spec, fields)}
              findings={bench.base.findings}
              findingsStale={bench.pending}
              units={units}
              onUnits={changeUnits}
              parts={bench.parts}
              fields={fields}
              deckClearanceMm={bench.spec.deckClearanceMm}
              revLimitRpm={bench.spec.revLimitRpm}
              canEdit={canEdit}
              onUseSuggested={(slot, id) => actions.pick(slot, id)}
              onUseSolved={(slot, field, value) =>
                post(
                  {
                    intent: "set-measured",
                    slot,
                    field,
                    value: String(value),
                    unit: field === "gasketThicknessMm" ? "mm" : "cc",
                  },
                  { intent: "set-measured", slot, field, value },
                  `${slot}.${field}`,
                )
              }
            />
          </div>
        </div>
        <DragOverlay>
          {dragging ? (
            <div className="w-64 rounded border border-teal bg-white px-2 py-1.5 text-sm shadow-lg">
              <PartCardBody part={dragging} category={dragging.category} />
            </div>
          ) : null}
        </DragOverlay>
      </DndContext>
    </main>
  );
}

export function meta({ data }: Route.MetaArgs) {
  return [{ title: `Spec bench · ${data?.header.name ?? "Package"} · Torquewright` }];
}
