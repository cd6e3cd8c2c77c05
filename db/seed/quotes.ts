import type { Kysely } from "kysely";
import { sendQuote } from "../../app/lib/quotes/store.server";
import type { Database } from "../schema";

// The demo shop's labour jobs, its tax rate, and the quotes of the demo packages: one
// quoted and waiting for its customer (an earlier card was declined), one approved with
// its deposit paid.
export const DEMO_JOBS = [
  {
    name: "Top end",
    hours: 800,
    slots: ["cylinder", "piston", "head", "gasket"],
    description: "Cylinders, pistons, heads and gaskets off and on, with a leak-down check",
  },
  {
    name: "Bottom end",
    hours: 1400,
    slots: ["flywheel", "rod"],
    description: "Cases split, flywheel assembly trued and fitted",
  },
  {
    name: "Cam job",
    hours: 450,
    slots: ["cam", "springs"],
    description: "Cam chest, cams, springs set to the installed height",
  },
  {
    name: "Chassis kit",
    hours: 500,
    slots: ["axle_adjusters", "rear_shocks", "risers", "clutch_line", "brake_lines"],
    description: "Rear-axle adjusters, shocks, bars and the lines they need",
  },
  {
    name: "Brake upgrade",
    hours: 300,
    slots: ["calipers", "rotors", "front_fork"],
    description: "Calipers, rotors and brackets, bled and bedded in",
  },
];

export async function seedQuotes(db: Kysely<Database>) {
  const writer = await db
    .selectFrom("users")
    .select("id")
    .where("role", "=", "service_writer")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  const owner = await db
    .selectFrom("users")
    .select("id")
    .where("role", "=", "owner")
    .orderBy("id")
    .executeTakeFirstOrThrow();
  await db
    .insertInto("labour_jobs")
    .values(
      DEMO_JOBS.map((j) => ({
        name: j.name,
        hours_hundredths: j.hours,
        slots: j.slots,
        description: j.description,
        updated_by: owner.id,
      })),
    )
    .execute();
  await db.updateTable("shop").set({ tax_rate_bp: 825 }).where("tax_rate_bp", "=", 0).execute();
  await db
    .updateTable("quote_settings")
    .set({ supplies_bp: 300, updated_by: owner.id })
    .where("id", "=", 1)
    .execute();

  const byStatus = async (status: "quoted" | "approved") =>
    db
      .selectFrom("packages")
      .select("id")
      .where("status", "=", status)
      .where("is_template", "=", false)
      .orderBy("id")
      .executeTakeFirst();
  const quoted = await byStatus("quoted");
  if (quoted) {
    await db
      .insertInto("quote_drafts")
      .values({
        package_id: quoted.id,
        extra_lines: JSON.stringify([
          {
            kind: "machine",
            description: "Bore and hone cylinders to the pistons' fit",
            quantityHundredths: 100,
            unitCents: 18500,
            taxable: false,
          },
        ]),
        discount: JSON.stringify({ kind: "none" }),
        deposit: null,
        note: "",
        updated_by: writer.id,
      })
      .execute();
    const out = await sendQuote(db, quoted.id, writer.id, new Date(), {
      mail: false,
      anyStatus: true,
    });
    if (!out.ok) throw new Error(`seed: could not quote the quoted package: ${out.message}`);
    await db
      .insertInto("payments")
      .values({
        quote_version_id: out.version.id,
        package_id: quoted.id,
        checkout_session_id: "cs_demo_declined_0001",
        amount_cents: out.version.totals.depositCents,
        status: "declined",
        failure: "Your card was declined.",
      })
      .execute();
  }
  const approved = await byStatus("approved");
  if (approved) {
    const out = await sendQuote(db, approved.id, writer.id, new Date(), {
      mail: false,
      anyStatus: true,
    });
    if (!out.ok) throw new Error(`seed: could not quote the approved package: ${out.message}`);
    await db
      .updateTable("quote_versions")
      .set({ status: "approved", approved_at: new Date() })
      .where("id", "=", out.version.id)
      .execute();
    await db
      .insertInto("payments")
      .values({
        quote_version_id: out.version.id,
        package_id: approved.id,
        checkout_session_id: "cs_demo_paid_0001",
        payment_intent_id: "pi_demo_paid_0001",
        amount_cents: out.version.totals.depositCents,
        status: "paid",
        paid_at: new Date(),
      })
      .execute();
  }
}
