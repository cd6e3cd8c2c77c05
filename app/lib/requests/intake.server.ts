// A rider's build request: the body is read with a size limit and refused when it is not
// plain form text; one address may send a few per hour; a stored request queues the
// shop's mail and the rider's confirmation in the same transaction.
import { readForm } from "../http/body";

import type { Db } from "../db.server";
import { env } from "../env.server";
import { queueMail } from "../mail/mail.server";
import {
  budgetLabel,
  CALL_BACK_PROMISE,
  contactLabel,
  ridingLabel,
  timeFrameLabel,
} from "./options";
import { MAX_BODY_BYTES, partLines, type BuildRequestInput } from "./request-form";

export const MAX_REQUESTS_PER_HOUR = 5;

export const BODY_REFUSED =
  "This form is larger than 16 KB, so it could not be read. Shorten what you wrote and send it again.";

/** The posted form through the shared reader, with the public form's small limit. */
export async function readFormBody(request: Request): Promise<FormData> {
  return readForm(request, {
    limitBytes: MAX_BODY_BYTES,
    fieldLimit: MAX_BODY_BYTES,
    tooLarge: BODY_REFUSED,
  });
}

/** True when this address already sent the hour's allowance of requests. */
export async function overRequestLimit(db: Db, address: string, now = new Date()) {
  const row = await db
    .selectFrom("build_requests")
    .where("client_address", "=", address)
    .where("created_at", ">", new Date(now.getTime() - 3600_000))
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirst();
  return Number(row?.n ?? 0) >= MAX_REQUESTS_PER_HOUR;
}

export async function familyExists(db: Db, id: number): Promise<boolean> {
  const row = await db
    .selectFrom("engine_families")
    .select("id")
    .where("id", "=", id)
    .where("archived_at", "is", null)
    .executeTakeFirst();
  return Boolean(row);
}

export async function createBuildRequest(
  db: Db,
  input: BuildRequestInput,
  address: string,
): Promise<number> {
  const shop = await db
    .selectFrom("shop")
    .select(["name", "email", "phone"])
    .orderBy("id")
    .limit(1)
    .executeTakeFirst();
  return db.transaction().execute(async (trx) => {
    const familyId = input.engineFamily === "unsure" ? null : Number(input.engineFamily);
    const family = familyId
      ? await trx
          .selectFrom("engine_families")
          .select("name")
          .where("id", "=", familyId)
          .executeTakeFirst()
      : undefined;
    const parts = partLines(input.currentParts);
    const { id } = await trx
      .insertInto("build_requests")
      .values({
        name: input.name,
        email: input.email,
        phone: input.phone ?? null,
        bike_year: input.bikeYear,
        engine_family_id: familyId,
        bike_model: input.bikeModel,
        mileage: input.mileage ?? null,
        current_parts: JSON.stringify(parts),
        goals: input.goals,
        riding: input.riding,
        budget: input.budget,
        time_frame: input.timeFrame,
        contact_by: input.contactBy,
        consent: true,
        client_address: address,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("build_request_status_changes")
      .values({ request_id: id, from_status: null, to_status: "new", changed_by: null })
      .execute();
    const bike = `${input.bikeYear} ${input.bikeModel}${family ? ` (${family.name})` : ""}`;
    const summary = [
      `Bike: ${bike}${input.mileage !== undefined ? `, ${input.mileage} miles` : ""}`,
      `On it now: ${parts.length ? parts.join("; ") : "nothing listed"}`,
      `Wants: ${input.goals}`,
      `Riding: ${input.riding.map(ridingLabel).join(", ") || "not given"}`,
      `Budget: ${budgetLabel(input.budget)}`,
      `Time frame: ${timeFrameLabel(input.timeFrame)}`,
    ];
    const shopName = shop?.name ?? "the shop";
    if (shop?.email)
      await queueMail(trx, {
        key: `build-request:${id}:shop`,
        to: shop.email,
        subject: `New build request #${id}: ${input.name}, ${input.bikeYear} ${input.bikeModel}`,
        text: [
          `A rider sent a build request (#${id}).`,
          "",
          `Name: ${input.name}`,
          `E-mail: ${input.email}`,
          `Phone: ${input.phone ?? "not given"}`,
          `Contact by: ${contactLabel(input.contactBy)}`,
          ...summary,
          "",
          `Open it: ${new URL(`/requests/${id}`, env().APP_URL).toString()}`,
        ].join("\n"),
      });
    await queueMail(trx, {
      key: `build-request:${id}:rider`,
      to: input.email,
      subject: `We have your build request — ${shopName}`,
      text: [
        `Hello ${input.name},`,
        "",
        `Thank you for asking ${shopName} about your bike. This is what you sent us (request #${id}):`,
        "",
        ...summary,
        "",
        CALL_BACK_PROMISE,
        `You asked us to reach you by ${contactLabel(input.contactBy).toLowerCase()}.`,
        shop?.phone ? `If anything changes, call us on ${shop.phone}.` : "",
      ].join("\n"),
    });
    return id;
  });
}

/** Requests by status, for the homes. */
export async function requestCounts(db: Db): Promise<Record<string, number>> {
  const rows = await db
    .selectFrom("build_requests")
    .groupBy("status")
    .select((eb) => ["status", eb.fn.countAll<number>().as("n")])
    .execute();
  return Object.fromEntries(rows.map((r) => [r.status, Number(r.n)]));
}
