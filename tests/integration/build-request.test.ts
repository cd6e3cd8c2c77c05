// The public build-request form: a valid request is stored with its status history and
// queues the shop's mail and the rider's confirmation; bad input gets a message beside
// its field with the other values kept; bots, over-long or binary bodies and a flood
// from one address store nothing.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { HONEYPOT_TRAP } from "~/lib/auth/honeypot";
import { CLIENT_ADDRESS_HEADER } from "~/lib/auth/throttle.server";
import { BODY_REFUSED, MAX_REQUESTS_PER_HOUR } from "~/lib/requests/intake.server";
import { PHONE_MESSAGE } from "~/lib/requests/request-form";
import * as page from "~/routes/build-request";
import { signedOutRequest } from "../support/auth";
import { args, run } from "../support/route";
import { ensureShop, postRequest, riderFields, tagOf } from "../support/requests";

const db = getDb();
const stored = (email: string) =>
  db.selectFrom("build_requests").selectAll().where("email", "=", email).execute();

beforeAll(() => ensureShop(db));

describe("/build-request", () => {
  it("stores a valid request, its first status and both e-mails, then thanks the rider", async () => {
    const tag = tagOf();
    const out = await run(() =>
      page.action(args(postRequest(riderFields(tag), `10.1.0.${tag.length}`))),
    );
    expect(out.status).toBe(302);
    expect(out.location).toBe("/build-request/thanks");
    const [row] = await stored(`rider-${tag}@example.test`);
    expect(row).toMatchObject({
      name: `Rider ${tag}`,
      phone: "555-0199",
      bike_year: 2019,
      engine_family_id: null,
      mileage: 31000,
      current_parts: ["big-bore kit two years ago", "aftermarket exhaust"],
      riding: ["two_up"],
      status: "new",
      consent: true,
    });
    const history = await db
      .selectFrom("build_request_status_changes")
      .select(["from_status", "to_status"])
      .where("request_id", "=", row!.id)
      .execute();
    expect(history).toEqual([{ from_status: null, to_status: "new" }]);
    const mails = await db
      .selectFrom("mail_messages")
      .select(["idempotency_key", "to_address", "subject", "text_body"])
      .where("idempotency_key", "like", `build-request:${row!.id}:%`)
      .orderBy("idempotency_key")
      .execute();
    expect(mails.map((m) => m.idempotency_key)).toEqual([
      `build-request:${row!.id}:rider`,
      `build-request:${row!.id}:shop`,
    ]);
    expect(mails[0]!.to_address).toBe(`rider-${tag}@example.test`);
    expect(mails[0]!.text_body).toContain("within two working days");
    expect(mails[1]!.subject).toBe(
      `New build request #${row!.id}: Rider ${tag}, 2019 Longhaul tourer`,
    );
    expect(mails[1]!.text_body).toContain(
      "On it now: big-bore kit two years ago; aftermarket exhaust",
    );
  });

  it("puts each error beside its field and keeps what was typed", async () => {
    const tag = tagOf();
    const out = await run(() =>
      page.action(
        args(
          postRequest(
            riderFields(tag, {
              email: "not-an-address",
              phone: "12",
              goals: "",
              bikeYear: "19",
              consent: "",
            }),
            "10.1.1.1",
          ),
        ),
      ),
    );
    expect(out.status).toBe(400);
    const { error, initialValue } = out.value.result;
    expect(error.email).toEqual(["Enter an e-mail address like name@example.com"]);
    expect(error.phone).toEqual([PHONE_MESSAGE]);
    expect(error.goals).toEqual(["Tell us what you want the bike to do"]);
    expect(error.bikeYear[0]).toMatch(/^Enter a model year between 1936 and \d{4}$/);
    expect(error.consent).toEqual(["Tick this so we may contact you about your request"]);
    expect(initialValue.bikeModel).toBe("Longhaul tourer");
    expect(initialValue.currentParts).toBe("big-bore kit two years ago\naftermarket exhaust");
    expect(await stored("not-an-address")).toEqual([]);
  });

  it("asks for a phone number when the rider wants a call", async () => {
    const out = await run(() =>
      page.action(args(postRequest(riderFields(tagOf(), { phone: "" }), "10.1.1.2"))),
    );
    expect(out.status).toBe(400);
    expect(out.value.result.error.phone).toEqual([
      "Enter a phone number, or pick e-mail as the way to contact you",
    ]);
  });

  it("refuses an engine that is not on the shop's list", async () => {
    const out = await run(() =>
      page.action(args(postRequest(riderFields(tagOf(), { engineFamily: "999999" }), "10.1.1.3"))),
    );
    expect(out.status).toBe(400);
    expect(out.value.result.error.engineFamily).toEqual([
      "Pick an engine from the list, or “Not sure”",
    ]);
  });

  it("gives a bot that fills the honeypot the same thank-you page and stores nothing", async () => {
    const tag = tagOf();
    const out = await run(() =>
      page.action(
        args(postRequest({ ...riderFields(tag), [HONEYPOT_TRAP]: "http://spam.test" }, "10.1.1.4")),
      ),
    );
    expect(out.status).toBe(302);
    expect(out.location).toBe("/build-request/thanks");
    expect(await stored(`rider-${tag}@example.test`)).toEqual([]);
  });

  it("refuses an over-long, a binary or a non-form body", async () => {
    const long = riderFields(tagOf(), { goals: "x".repeat(20_000) });
    const over = await run(() => page.action(args(postRequest(long, "10.1.1.5"))));
    expect(over.status).toBe(413);
    expect(over.value).toBe(BODY_REFUSED);
    const binary = signedOutRequest("/build-request", {
      method: "POST",
      body: new Uint8Array([0x6e, 0x61, 0x6d, 0x65, 0x3d, 0xff, 0xfe, 0x00]),
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
    });
    expect((await run(() => page.action(args(binary)))).status).toBe(400);
    const nul = signedOutRequest("/build-request", {
      method: "POST",
      body: "name=a%00b",
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
    });
    const refusedNul = await run(() => page.action(args(nul)));
    expect(refusedNul.status).toBe(400);
    expect(refusedNul.value).toBe(
      "The “name” field contains a control character (such as a NUL byte) that cannot be stored; remove it.",
    );
    const bell = await run(() =>
      page.action(args(postRequest(riderFields(tagOf(), { name: "Ro\u0007sa" }), "10.1.1.6"))),
    );
    expect(bell.status).toBe(400);
    expect(bell.value).toBe(
      "The “name” field contains a control character (such as a NUL byte) that cannot be stored; remove it.",
    );
    const json = signedOutRequest("/build-request", {
      method: "POST",
      body: JSON.stringify({ name: "x" }),
      headers: { "Content-Type": "application/json" },
    });
    expect((await run(() => page.action(args(json)))).status).toBe(415);
  });

  it(`takes ${MAX_REQUESTS_PER_HOUR} requests an hour from one address, then asks to wait`, async () => {
    const address = `10.2.${Math.floor(Math.random() * 200)}.${Math.floor(Math.random() * 200)}`;
    for (let i = 0; i < MAX_REQUESTS_PER_HOUR; i++) {
      const out = await run(() => page.action(args(postRequest(riderFields(tagOf()), address))));
      expect(out.status).toBe(302);
    }
    const tag = tagOf();
    const refused = await run(() => page.action(args(postRequest(riderFields(tag), address))));
    expect(refused.status).toBe(429);
    expect(refused.value.result.error[""]).toEqual([
      "We already have several requests from this connection in the last hour. Please try again later or call the shop.",
    ]);
    expect(refused.value.result.initialValue.name).toBe(`Rider ${tag}`);
    expect(await stored(`rider-${tag}@example.test`)).toEqual([]);
    expect(CLIENT_ADDRESS_HEADER).toBe("x-torquewright-client-address");
  });
});
