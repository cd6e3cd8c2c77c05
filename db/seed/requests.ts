// Demo engine families (with their stock parts in the catalog), the parts the demo bikes
// carry, build requests in every status, and one keep-check with an override. Every
// name, VIN, address and number is made up.
import type { Kysely } from "kysely";
import type { Database } from "../schema";
import type { RequestStatus } from "../schema/requests";
import { createPart, getPartByNumber } from "../../app/lib/catalog/parts.server";
import { createFamily } from "../../app/lib/engine-families/families.server";
import type { FamilyInput } from "../../app/lib/engine-families/family";
import { createPackage, saveEdit } from "../../app/lib/packages/store.server";
import { startingSpecForBike } from "../../app/lib/packages/from-bike.server";
import { normaliseSpec } from "../../app/lib/bench/spec";

const cc = (bore: number, stroke: number) =>
  Math.round((Math.PI / 4) * (bore / 10) ** 2 * (stroke / 10) * 2);

const COMMON_STOCK = {
  head: "TW-HD-0890",
  gasket: "TW-HG-0991",
  cam: "TW-CAM-STD",
  springs: "TW-VS-600",
  rod: "TW-ROD-1890",
  axle_adjusters: "TW-AX-STD",
  rear_shocks: "TW-SH-STD",
  calipers: "TW-CAL-STD",
  rotors: "TW-ROT-STD",
  risers: "TW-RS-04",
  clutch_line: "TW-CL-STD",
  brake_lines: "TW-BL-STD",
};

export const DEMO_FAMILIES = [
  {
    name: "Corvane large twin 107",
    yearFrom: 2017,
    yearTo: 2019,
    boreMm: 98.4,
    strokeMm: 114.3,
    deckHeightMm: 257.3,
    revLimitRpm: 5600,
    stock: { cylinder: "TW-CYL-0984", flywheel: "TW-FLY-1143", piston: "TW-PST-0984" },
    notes: "Oil-cooled heads on the touring models.",
  },
  {
    name: "Corvane large twin 114",
    yearFrom: 2017,
    yearTo: 2023,
    boreMm: 101.6,
    strokeMm: 114.3,
    deckHeightMm: 257.3,
    revLimitRpm: 5600,
    stock: {
      cylinder: "TW-CYL-1016",
      flywheel: "TW-FLY-1143",
      piston: "TW-PST-1016",
      gasket: "TW-HG-1021S",
    },
    notes: "",
  },
  {
    name: "Brisa Vanta 103",
    yearFrom: 2012,
    yearTo: 2017,
    boreMm: 98.4,
    strokeMm: 111.1,
    deckHeightMm: 254.0,
    revLimitRpm: 5500,
    stock: { cylinder: "TW-CYL-0984", flywheel: "TW-FLY-1111S", piston: "TW-PST-0984" },
    notes: "Two-cam bottom end; check the cam plate before a bigger cam.",
  },
];

// demo bikes (db/seed/core.ts) by VIN → family, with real-length (17) invented VINs
const BIKE_FAMILY: Record<string, { family: string; vin17: string }> = {
  DEMO1LH19000001: { family: "Corvane large twin 107", vin17: "9TW1LH19XKD000001" },
  DEMO1NB21000002: { family: "Corvane large twin 114", vin17: "9TW1NB21XMD000002" },
  DEMO1BV17000003: { family: "Brisa Vanta 103", vin17: "9TW1BV17XHD000003" },
  DEMO1LH22000004: { family: "Corvane large twin 114", vin17: "9TW1LH22XND000004" },
  DEMO1BV20000005: { family: "Corvane large twin 114", vin17: "9TW1BV20XLD000005" },
  DEMO1NB18000006: { family: "Corvane large twin 107", vin17: "9TW1NB18XJD000006" },
};

type Installed = {
  number?: string;
  category: string;
  description: string;
  fittedOn?: string;
  mileage?: number;
};

const INSTALLED: Record<string, Installed[]> = {
  DEMO1LH22000004: [
    { number: "TW-CYL-1016", category: "cylinders", description: "Stock cylinders" },
    { number: "TW-HD-0890", category: "heads", description: "Stock heads" },
    { number: "TW-AX-STD", category: "axle_adjusters", description: "Stock rear-axle adjusters" },
    {
      number: "TW-CL-P04",
      category: "clutch_lines",
      description: "Light-duty clutch cable fitted with mini-apes",
      fittedOn: "2023-04-18",
      mileage: 2100,
    },
    {
      number: "TW-SH-13",
      category: "rear_shocks",
      description: "Adjustable rear shocks, 13 in",
      fittedOn: "2023-04-18",
      mileage: 2100,
    },
    {
      number: "TW-EX-21",
      category: "exhaust",
      description: "2-into-1 exhaust",
      fittedOn: "2024-03-02",
      mileage: 4800,
    },
    {
      category: "intake",
      description: "Aftermarket air cleaner, maker unknown",
      fittedOn: "2024-06-10",
      mileage: 5600,
    },
  ],
  DEMO1LH19000001: [
    { number: "TW-AX-STD", category: "axle_adjusters", description: "Stock rear-axle adjusters" },
    {
      number: "TW-EX-TD",
      category: "exhaust",
      description: "True-dual exhaust",
      fittedOn: "2021-05-14",
      mileage: 14100,
    },
  ],
  DEMO1BV20000005: [
    {
      number: "TW-AIR-HF",
      category: "intake",
      description: "High-flow air cleaner",
      fittedOn: "2022-08-01",
      mileage: 9000,
    },
  ],
};

type DemoRequest = {
  status: RequestStatus;
  name: string;
  email: string;
  phone: string | null;
  year: number;
  family: string | null;
  model: string;
  mileage: number | null;
  parts: string[];
  goals: string;
  riding: string[];
  budget: string;
  timeFrame: string;
  contactBy: string;
  daysAgo: number;
  notes?: string[];
  linkVin?: string;
};

const REQUESTS: DemoRequest[] = [
  {
    status: "new",
    name: "Rosalind Featherby",
    email: "ros.f@example.test",
    phone: "555-0177",
    year: 2020,
    family: "Corvane large twin 114",
    model: "Corvane Longhaul LT",
    mileage: 22400,
    parts: ["aftermarket exhaust", "stage 1 air cleaner"],
    goals: "More pull for passing with a passenger and luggage.",
    riding: ["two_up", "solo_touring"],
    budget: "6k_10k",
    timeFrame: "3_months",
    contactBy: "phone",
    daysAgo: 1,
  },
  {
    status: "new",
    name: "Otto Pennywhistle",
    email: "otto.p@example.test",
    phone: null,
    year: 2015,
    family: null,
    model: "Brisa Vanta, not sure which",
    mileage: 61000,
    parts: ["big-bore kit two years ago"],
    goals: "It pings on hills since the big-bore kit. Want it sorted and a bit more power.",
    riding: ["mountains"],
    budget: "3k_6k",
    timeFrame: "asap",
    contactBy: "email",
    daysAgo: 3,
  },
  {
    status: "contacted",
    name: "Beatrix Calloway",
    email: "bea.c@example.test",
    phone: "555-0108",
    year: 2018,
    family: "Corvane large twin 107",
    model: "Corvane Northbound",
    mileage: 40200,
    parts: [],
    goals: "A few track days a year without hurting the bike for the commute.",
    riding: ["track_days"],
    budget: "10k_15k",
    timeFrame: "season",
    contactBy: "text",
    daysAgo: 6,
    notes: ["Called; wants a quote before the winter layup."],
  },
  {
    status: "waiting_on_rider",
    name: "Lorcan Abernethy",
    email: "lorcan.a@example.test",
    phone: "555-0150",
    year: 2016,
    family: "Brisa Vanta 103",
    model: "Brisa Vanta 103",
    mileage: 73800,
    parts: ["cam swapped by a previous owner", "tall bars"],
    goals: "Reliable cross-country, a little more torque.",
    riding: ["solo_touring", "mountains"],
    budget: "unsure",
    timeFrame: "flexible",
    contactBy: "email",
    daysAgo: 12,
    notes: ["Asked for the cam's card or part number; waiting on photos."],
  },
  {
    status: "converted",
    name: "Walt Berglund",
    email: "walt.b@example.test",
    phone: "555-0163",
    year: 2022,
    family: "Corvane large twin 114",
    model: "Corvane Longhaul LT",
    mileage: 6100,
    parts: ["2-into-1 exhaust", "shocks 13 in", "air cleaner, not sure which"],
    goals: "150 hp for highway passing, two-up sometimes.",
    riding: ["two_up", "solo_touring"],
    budget: "over_15k",
    timeFrame: "1_month",
    contactBy: "phone",
    daysAgo: 20,
    notes: ["Existing customer (drag bike); linked to his record."],
    linkVin: "DEMO1LH22000004",
  },
  {
    status: "declined",
    name: "Greer Whitlock",
    email: "greer.w@example.test",
    phone: "555-0133",
    year: 2008,
    family: null,
    model: "Old carbureted twin",
    mileage: 98000,
    parts: ["carb kit"],
    goals: "Track-only race motor.",
    riding: ["track_days"],
    budget: "under_3k",
    timeFrame: "asap",
    contactBy: "email",
    daysAgo: 30,
    notes: ["Outside what we build for the budget; referred to a race-only shop."],
  },
];

const PATHS: Record<RequestStatus, RequestStatus[]> = {
  new: [],
  contacted: ["contacted"],
  waiting_on_rider: ["contacted", "waiting_on_rider"],
  converted: ["contacted", "converted"],
  declined: ["contacted", "declined"],
};

async function partId(db: Kysely<Database>, number: string): Promise<number> {
  const p = await getPartByNumber(db, number);
  if (!p) throw new Error(`seed: no demo part ${number}`);
  return p.id;
}

export async function seedRequests(db: Kysely<Database>) {
  const staff = await db.selectFrom("users").select(["id", "role"]).orderBy("id").execute();
  const writer = staff.find((s) => s.role === "service_writer")!.id;
  const builder = staff.find((s) => s.role === "builder")!.id;
  const owner = staff.find((s) => s.role === "owner")!.id;

  // parts the families and bikes need that the shelf does not have yet
  await createPart(
    db,
    {
      part_number: "TW-FLY-1111S",
      category: "flywheels",
      maker: "Vantry Motorworks",
      name: "Flywheel assembly, 111.1 mm stroke (as delivered)",
      price: 0,
      labour_hours: 0,
      tags: ["stock-flywheel"],
      stock: true,
      notes: "",
      attributes: { strokeMm: 111.1 },
    },
    owner,
    "Added to the shelf",
  );
  await createPart(
    db,
    {
      part_number: "TW-HG-1021S",
      category: "head_gaskets",
      maker: "Vantry Motorworks",
      name: "Head gaskets, 102.1 mm × 1.02 mm (as delivered, large twin)",
      price: 0,
      labour_hours: 0,
      tags: ["stock-gaskets"],
      stock: true,
      notes: "",
      attributes: { boreMm: 102.1, compressedThicknessMm: 1.02 },
    },
    owner,
    "Added to the shelf",
  );
  await createPart(
    db,
    {
      part_number: "TW-CL-P04",
      category: "clutch_lines",
      maker: "Corrie Bend Cycle",
      name: "Clutch cable, +4 in, light duty",
      price: 79,
      labour_hours: 1,
      tags: ["extended-clutch-cable"],
      stock: false,
      notes: "",
      attributes: { lengthIn: 62, ratedHp: 120, ratedTorqueNm: 160 },
    },
    owner,
    "Added to the shelf",
  );

  const familyIds = new Map<string, number>();
  for (const f of DEMO_FAMILIES) {
    const input: Record<string, unknown> = {
      name: f.name,
      yearFrom: f.yearFrom,
      yearTo: f.yearTo,
      boreMm: f.boreMm,
      strokeMm: f.strokeMm,
      displacementCc: cc(f.boreMm, f.strokeMm),
      deckHeightMm: f.deckHeightMm,
      revLimitRpm: f.revLimitRpm,
      notes: f.notes,
    };
    for (const [slot, number] of Object.entries({ ...COMMON_STOCK, ...f.stock }))
      input[`stock_${slot}`] = await partId(db, number);
    familyIds.set(f.name, await createFamily(db, input as FamilyInput, owner));
  }

  const bikeIds = new Map<string, number>();
  for (const [vin, { family, vin17 }] of Object.entries(BIKE_FAMILY)) {
    const bike = await db
      .updateTable("bikes")
      .set({ engine_family_id: familyIds.get(family)!, vin: vin17 })
      .where("vin", "=", vin)
      .returning("id")
      .executeTakeFirstOrThrow();
    bikeIds.set(vin, bike.id);
    for (const p of INSTALLED[vin] ?? []) {
      await db
        .insertInto("bike_parts")
        .values({
          bike_id: bike.id,
          part_id: p.number ? await partId(db, p.number) : null,
          category: p.category,
          description: p.description,
          fitted_on: p.fittedOn ?? null,
          fitted_mileage: p.mileage ?? null,
          created_by: writer,
        })
        .execute();
    }
  }

  // Walt's touring bike: a package started from what the bike carries, built up to 150 hp
  const waltBike = bikeIds.get("DEMO1LH22000004")!;
  const start = await startingSpecForBike(db, waltBike);
  const packageId = await createPackage(
    db,
    {
      name: "Touring passing power, 124 ci",
      bikeId: waltBike,
      isTemplate: false,
      builderId: builder,
      spec: start,
      notes: "Started from the bike's family and installed parts.",
      change: "Started from the bike's parts",
    },
    writer,
  );
  const spec = normaliseSpec(start);
  spec.slots.cylinder = { partId: await partId(db, "TW-CYL-1048"), measured: {} };
  spec.slots.piston = { partId: await partId(db, "TW-PST-1048F"), measured: {} };
  spec.slots.flywheel = { partId: await partId(db, "TW-FLY-1175"), measured: {} };
  spec.slots.gasket = { partId: await partId(db, "TW-HG-1054"), measured: {} };
  spec.slots.cam = { partId: await partId(db, "TW-CAM-600G"), measured: {} };
  spec.slots.springs = { partId: await partId(db, "TW-VS-650"), measured: {} };
  spec.deckClearanceMm = 0.25;
  spec.revLimitRpm = 6200;
  spec.powerHp = 150;
  spec.powerBasis = "target";
  const version = await db
    .selectFrom("packages")
    .select("version")
    .where("id", "=", packageId)
    .executeTakeFirstOrThrow();
  const saved = await saveEdit(db, {
    packageId,
    expectedVersion: version.version,
    spec,
    change: "Big-bore stroker top and bottom end, 150 hp target",
    userId: builder,
  });
  if (!saved.ok) throw new Error("seed: could not save the demo keep-check package");
  const exhaust = await db
    .selectFrom("bike_parts")
    .select("id")
    .where("bike_id", "=", waltBike)
    .where("category", "=", "exhaust")
    .executeTakeFirstOrThrow();
  await db
    .insertInto("keep_check_overrides")
    .values({
      package_id: packageId,
      bike_part_id: exhaust.id,
      mark: "keep",
      note: "We fitted this 2-into-1 last spring; it flows enough for 150 hp. Keep it and re-map.",
      set_by: writer,
    })
    .execute();

  const now = Date.now();
  for (const r of REQUESTS) {
    const created = new Date(now - r.daysAgo * 86_400_000);
    const linkBike = r.linkVin ? bikeIds.get(r.linkVin)! : null;
    const customer = linkBike
      ? await db
          .selectFrom("bikes")
          .select("customer_id")
          .where("id", "=", linkBike)
          .executeTakeFirstOrThrow()
      : null;
    const req = await db
      .insertInto("build_requests")
      .values({
        name: r.name,
        email: r.email,
        phone: r.phone,
        bike_year: r.year,
        engine_family_id: r.family ? familyIds.get(r.family)! : null,
        bike_model: r.model,
        mileage: r.mileage,
        current_parts: JSON.stringify(r.parts),
        goals: r.goals,
        riding: r.riding,
        budget: r.budget,
        time_frame: r.timeFrame,
        contact_by: r.contactBy,
        consent: true,
        status: r.status,
        customer_id: customer?.customer_id ?? null,
        bike_id: linkBike,
        package_id: linkBike ? packageId : null,
        created_at: created,
        updated_at: created,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await db
      .insertInto("build_request_status_changes")
      .values({ request_id: req.id, from_status: null, to_status: "new", changed_at: created })
      .execute();
    let from: RequestStatus = "new";
    let at = created.getTime();
    for (const to of PATHS[r.status]) {
      at += 86_400_000 / 2;
      await db
        .insertInto("build_request_status_changes")
        .values({
          request_id: req.id,
          from_status: from,
          to_status: to,
          changed_by: writer,
          changed_at: new Date(at),
        })
        .execute();
      from = to;
    }
    for (const body of r.notes ?? [])
      await db
        .insertInto("build_request_notes")
        .values({ request_id: req.id, body, author_id: writer, created_at: new Date(at) })
        .execute();
  }
}
