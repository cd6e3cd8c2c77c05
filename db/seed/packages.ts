// Demo packages on the demo customers' bikes, in different statuses, plus one shop
// template. Parts are looked up by the demo catalog's part numbers. One package trips
// the power rule (150 hp target on stock axle adjusters), one has a gasket bore under
// the cylinder bore. Each name's cubic inches are what its parts compute to (± 0.5 ci;
// db/seed/packages.test.ts checks it).
import type { Kysely } from "kysely";
import type { Database } from "../schema";
import type { PackageStatus } from "../schema/packages";
import { changeStatus, createPackage, saveEdit } from "../../app/lib/packages/store.server";
import { emptySpec, type BenchSpec } from "../../app/lib/bench/spec";

type Demo = {
  name: string;
  vin: string | null;
  status: PackageStatus;
  parts: Record<string, string>;
  numbers: Partial<Pick<BenchSpec, "deckClearanceMm" | "revLimitRpm" | "powerHp" | "powerBasis">>;
  measured?: { slot: string; field: string; value: number }[];
  notes: string;
};

const PATH: Record<PackageStatus, PackageStatus[]> = {
  draft: [],
  quoted: ["quoted"],
  approved: ["quoted", "approved"],
  in_build: ["quoted", "approved", "in_build"],
  on_dyno: ["quoted", "approved", "in_build", "on_dyno"],
  delivered: ["quoted", "approved", "in_build", "on_dyno", "delivered"],
  cancelled: ["cancelled"],
};

export const DEMO_PACKAGES: Demo[] = [
  {
    name: "Highway passing power, 124 ci stroker",
    vin: "DEMO1LH19000001",
    status: "draft",
    parts: {
      cylinder: "TW-CYL-1048",
      flywheel: "TW-FLY-1175",
      piston: "TW-PST-1048F",
      head: "TW-HD-0845",
      gasket: "TW-HG-1054",
      cam: "TW-CAM-600G",
      springs: "TW-VS-650",
      rod: "TW-ROD-1890",
      axle_adjusters: "TW-AX-STD",
      risers: "TW-RS-04",
      clutch_line: "TW-CL-STD",
      brake_lines: "TW-BL-STD",
    },
    numbers: { deckClearanceMm: 0.25, revLimitRpm: 6200, powerHp: 150, powerBasis: "target" },
    notes: "Two-up touring; rider wants 150 hp at the wheel. Chassis list still open.",
  },
  {
    name: "Mountain torque, 113 ci",
    vin: "DEMO1NB21000002",
    status: "quoted",
    parts: {
      cylinder: "TW-CYL-1016",
      flywheel: "TW-FLY-1143",
      piston: "TW-PST-1016D",
      head: "TW-HD-0890",
      gasket: "TW-HG-0991",
      cam: "TW-CAM-585",
      springs: "TW-VS-600",
      rod: "TW-ROD-1890",
      axle_adjusters: "TW-AX-STD",
      risers: "TW-RS-04",
      clutch_line: "TW-CL-STD",
      brake_lines: "TW-BL-STD",
    },
    numbers: { deckClearanceMm: 0.2, revLimitRpm: 5800, powerHp: 118, powerBasis: "estimate" },
    notes: "Stock gasket carried over from the old top end: check the gasket bore before ordering.",
  },
  {
    name: "Drag nights, 135 ci with tall bars",
    vin: "DEMO1BV17000003",
    status: "approved",
    parts: {
      cylinder: "TW-CYL-1080",
      flywheel: "TW-FLY-1207",
      piston: "TW-PST-1080",
      head: "TW-HD-0885CR",
      gasket: "TW-HG-1085",
      cam: "TW-CAM-650G",
      springs: "TW-VS-700",
      rod: "TW-ROD-1930",
      axle_adjusters: "TW-AX-LOCK",
      risers: "TW-RS-14",
      clutch_line: "TW-CL-P10",
      brake_lines: "TW-BL-P10",
    },
    numbers: { deckClearanceMm: 0.3, revLimitRpm: 6400, powerHp: 165, powerBasis: "target" },
    measured: [{ slot: "head", field: "chamberCc", value: 89.2 }],
    notes: "Heads cc'd on the bench at 89.2 cc.",
  },
  {
    name: "Daily rider refresh, 113 ci",
    vin: "DEMO1BV20000005",
    status: "in_build",
    parts: {
      cylinder: "TW-CYL-1016",
      flywheel: "TW-FLY-1143",
      piston: "TW-PST-1016",
      head: "TW-HD-0890",
      gasket: "TW-HG-1021-102",
      cam: "TW-CAM-585",
      springs: "TW-VS-600",
      rod: "TW-ROD-1890",
      axle_adjusters: "TW-AX-STD",
      risers: "TW-RS-04",
      clutch_line: "TW-CL-STD",
      brake_lines: "TW-BL-STD",
    },
    numbers: { deckClearanceMm: 0.25, revLimitRpm: 5600, powerHp: 105, powerBasis: "estimate" },
    notes: "Pump fuel only; keep it mild.",
  },
  {
    name: "Cross-country reliability, 106 ci",
    vin: "DEMO1NB18000006",
    status: "delivered",
    parts: {
      cylinder: "TW-CYL-0984",
      flywheel: "TW-FLY-1143",
      piston: "TW-PST-0984",
      head: "TW-HD-0890",
      gasket: "TW-HG-0991",
      cam: "TW-CAM-STD",
      springs: "TW-VS-600",
      rod: "TW-ROD-1890",
      axle_adjusters: "TW-AX-STD",
      risers: "TW-RS-04",
      clutch_line: "TW-CL-STD",
      brake_lines: "TW-BL-STD",
    },
    numbers: { deckClearanceMm: 0.25, revLimitRpm: 5500, powerHp: 92, powerBasis: "estimate" },
    notes: "Freshened top end before the spring trip.",
  },
  {
    name: "Shop template: stage 2 bolt-in, 113 ci",
    vin: null,
    status: "draft",
    parts: {
      cylinder: "TW-CYL-1016",
      flywheel: "TW-FLY-1143",
      piston: "TW-PST-1016",
      head: "TW-HD-0890",
      gasket: "TW-HG-1021-102",
      cam: "TW-CAM-585",
      springs: "TW-VS-650",
      rod: "TW-ROD-1890",
      axle_adjusters: "TW-AX-STD",
      risers: "TW-RS-04",
      clutch_line: "TW-CL-STD",
      brake_lines: "TW-BL-STD",
    },
    numbers: { deckClearanceMm: 0.25, revLimitRpm: 5800, powerHp: 110, powerBasis: "estimate" },
    notes: "Starting point for bolt-in cam packages on the large twin.",
  },
];

export async function seedPackages(db: Kysely<Database>) {
  const builder = await db
    .selectFrom("users")
    .select("id")
    .where("role", "=", "builder")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  const numbers = [...new Set(DEMO_PACKAGES.flatMap((d) => Object.values(d.parts)))];
  const parts = await db
    .selectFrom("parts")
    .select(["id", "part_number"])
    .where("part_number", "in", numbers)
    .execute();
  const idOf = new Map(parts.map((p) => [p.part_number, p.id]));
  for (const d of DEMO_PACKAGES) {
    const bike = d.vin
      ? await db.selectFrom("bikes").select("id").where("vin", "=", d.vin).executeTakeFirstOrThrow()
      : null;
    const id = await createPackage(
      db,
      {
        name: d.name,
        bikeId: bike?.id ?? null,
        isTemplate: !bike,
        builderId: builder.id,
        notes: d.notes,
      },
      builder.id,
    );
    // built the way a builder would: engine parts first, then the numbers, then the chassis
    let spec = emptySpec();
    let version = 1;
    const save = async (next: BenchSpec, change: string) => {
      const out = await saveEdit(db, {
        packageId: id,
        expectedVersion: version,
        spec: next,
        change,
        userId: builder.id,
      });
      if (!out.ok) throw new Error(`seed: could not save ${d.name}`);
      version = out.version;
      spec = next;
    };
    const engine = Object.entries(d.parts).filter(([slot]) =>
      ["cylinder", "flywheel", "piston", "head", "gasket", "cam", "springs", "rod"].includes(slot),
    );
    const chassis = Object.entries(d.parts).filter(([slot]) => !engine.some(([s]) => s === slot));
    const withParts = (list: [string, string][]) => {
      const next: BenchSpec = { ...spec, slots: { ...spec.slots } };
      for (const [slot, number] of list) {
        const partId = idOf.get(number);
        if (!partId) throw new Error(`seed: no demo part ${number}`);
        next.slots[slot] = { partId, measured: {} };
      }
      return next;
    };
    await save(withParts(engine), "Engine parts from the shelf");
    await save({ ...spec, ...d.numbers }, "Deck, rev limit and power");
    if (chassis.length > 0) await save(withParts(chassis), "Chassis parts");
    for (const m of d.measured ?? []) {
      const s = spec.slots[m.slot]!;
      await save(
        {
          ...spec,
          slots: {
            ...spec.slots,
            [m.slot]: { ...s, measured: { ...s.measured, [m.field]: m.value } },
          },
        },
        `Measured ${m.field} ${m.value}`,
      );
    }
    for (const to of bike ? PATH[d.status] : []) await changeStatus(db, id, to, builder.id);
  }
}
