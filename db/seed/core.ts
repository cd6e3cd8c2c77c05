import type { Kysely } from "kysely";
import type { Database } from "../schema";

// The demo scenario: an invented shop, its staff, customers and their bikes.
// Every name, address and number here is made up.
export const DEMO_SHOP = {
  name: "Tallgrass Twin Works",
  city: "Millbrook Falls",
  phone: "555-0142",
  email: "shop@tallgrass.test",
  labour_rate_cents: 13500,
  address: "410 Prairie Rail Road, Millbrook Falls",
  tax_rate_bp: 825,
  deposit_kind: "percent" as const,
  deposit_value: 3000,
  time_zone: "America/Chicago",
};

export const DEMO_STAFF = [
  { email: "dana@tallgrass.test", name: "Dana Okonkwo-Reyes", role: "owner" },
  { email: "rui@tallgrass.test", name: "Rui Castellane", role: "builder" },
  { email: "mara@tallgrass.test", name: "Mara Lindqvale", role: "service_writer" },
  { email: "teo@tallgrass.test", name: "Teo Varkonyi", role: "apprentice" },
] as const;

const CUSTOMERS = [
  {
    name: "Jesse Harrowgate",
    email: "jesse.h@example.test",
    phone: "555-0181",
    city: "Millbrook Falls",
    notes: "Two-up touring most weekends; wants passing power at highway speed.",
    bikes: [
      {
        year: 2019,
        model: "Corvane Longhaul LT",
        vin: "DEMO1LH19000001",
        engine_ci: 107,
        mileage: 38200,
      },
    ],
  },
  {
    name: "Priya Santangelo",
    email: "priya.s@example.test",
    phone: "555-0112",
    city: "Oak Hollow",
    notes: "Rides mountain passes; prefers torque over peak numbers.",
    bikes: [
      {
        year: 2021,
        model: "Corvane Northbound",
        vin: "DEMO1NB21000002",
        engine_ci: 114,
        mileage: 12900,
      },
    ],
  },
  {
    name: "Walt Berglund",
    email: "walt.b@example.test",
    phone: "555-0163",
    city: "Cedar Run",
    notes: "Drag-strip nights; knows the bike will see 14-inch risers next season.",
    bikes: [
      {
        year: 2017,
        model: "Brisa Vanta 103",
        vin: "DEMO1BV17000003",
        engine_ci: 103,
        mileage: 51400,
      },
      {
        year: 2022,
        model: "Corvane Longhaul LT",
        vin: "DEMO1LH22000004",
        engine_ci: 114,
        mileage: 6100,
      },
    ],
  },
  {
    name: "Ines Oduya",
    email: "ines.o@example.test",
    phone: "555-0127",
    city: "Millbrook Falls",
    notes: "Daily rider; budget-minded; pump fuel only.",
    bikes: [
      {
        year: 2020,
        model: "Brisa Vanta 114",
        vin: "DEMO1BV20000005",
        engine_ci: 114,
        mileage: 27750,
      },
    ],
  },
  {
    name: "Cal Montrose",
    email: "cal.m@example.test",
    phone: "555-0190",
    city: "Oak Hollow",
    notes: "Cross-country trip in spring; reliability first.",
    bikes: [
      {
        year: 2018,
        model: "Corvane Northbound",
        vin: "DEMO1NB18000006",
        engine_ci: 107,
        mileage: 64300,
      },
    ],
  },
];

export async function seedCore(db: Kysely<Database>) {
  await db.insertInto("shop").values(DEMO_SHOP).execute();
  await db
    .insertInto("users")
    .values(DEMO_STAFF.map((s) => ({ ...s, password_hash: null })))
    .execute();
  for (const { bikes, ...customer } of CUSTOMERS) {
    const { id } = await db
      .insertInto("customers")
      .values(customer)
      .returning("id")
      .executeTakeFirstOrThrow();
    for (const bike of bikes) {
      await db
        .insertInto("bikes")
        .values({ ...bike, customer_id: id, notes: "" })
        .execute();
    }
  }
}
