// Quotes end to end through the routes' loaders and actions, the local payment service
// (the same module npm start runs, on its own port here) and signed webhooks: price a
// package from its parts and the shop's jobs, add machine work, send, open the link,
// approve, be declined, pay, repeat and forge webhooks, refund out of order, and the
// payment service being down.
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startPaymentFake, type PaymentFake } from "../../scripts/services/payment-fake";

const WEBHOOK_SECRET = `whsec_test_${randomBytes(8).toString("hex")}`;
const fake: PaymentFake = await startPaymentFake({ webhookSecret: WEBHOOK_SECRET, quiet: true });
process.env.STRIPE_SECRET_KEY = "sk_test_quotes";
process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;
process.env.STRIPE_API_URL = fake.url;

const { getDb } = await import("~/lib/db.server");
const { ensureBuiltInCategories } = await import("~/lib/catalog/parts.server");
const { createPackage } = await import("~/lib/packages/store.server");
const { emptySpec } = await import("~/lib/bench/spec");
const quoteRoute = await import("~/routes/packages.$id.quote");
const customerRoute = await import("~/routes/q.$token");
const webhook = await import("~/routes/api.webhooks.payments");
const { stopJobs } = await import("~/lib/mail/jobs.server");
const { SERVICE_DOWN } = await import("~/lib/payments/deposits.server");
const sheetPdf = await import("~/routes/packages.$id.sheet[.]pdf");
const quotePdf = await import("~/routes/packages.$id.quote[.]pdf");
const { PDFParse } = await import("pdf-parse");
const { createTestUser, requestAs, signedOutRequest, form } = await import("../support/auth");
const { args, run } = await import("../support/route");

const db = getDb();
const tag = randomBytes(4).toString("hex");
type U = Awaited<ReturnType<typeof createTestUser>>;
let owner: U, writer: U, apprentice: U;
let packageId = 0;
let labourRate = 0;
let taxBp = 0;
const part: Record<string, number> = {};

async function addPart(
  key: string,
  category: string,
  priceCents: number,
  hours: number,
  attributes: Record<string, number>,
) {
  part[key] = (
    await db
      .insertInto("parts")
      .values({
        part_number: `Q-${tag}-${key}`,
        category,
        maker: "Test Works",
        name: `Quote test ${key}`,
        price_cents: priceCents,
        labour_hours: hours,
        tags: [],
        stock: false,
        attributes: JSON.stringify(attributes),
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
}

async function newPackage(name: string, email: string | null): Promise<number> {
  const c = await db
    .insertInto("customers")
    .values({ name: `Rider ${tag} ${name}`, email, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const bike = await db
    .insertInto("bikes")
    .values({ customer_id: c.id, year: 2018, model: `Quote twin ${tag}`, notes: "" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const spec = emptySpec();
  spec.slots.cylinder = { partId: part.cyl, measured: {} };
  spec.slots.head = { partId: part.head, measured: {} };
  spec.slots.flywheel = { partId: part.fly, measured: {} };
  return createPackage(
    db,
    { name: `Quote ${name} ${tag}`, bikeId: bike.id, isTemplate: false, builderId: null, spec },
    owner.id,
  );
}

const quoteLoader = async (who: U, id: number, query = "") =>
  run(async () =>
    quoteRoute.loader(
      args(await requestAs(who, `/packages/${id}/quote${query}`), { id: String(id) }),
    ),
  );
const quoteAction = async (who: U, id: number, fields: Record<string, string>) =>
  run(async () =>
    quoteRoute.action(
      args(await requestAs(who, `/packages/${id}/quote`, { method: "POST", body: form(fields) }), {
        id: String(id),
      }),
    ),
  );
const customer = (token: string, fields?: Record<string, string>) =>
  run(async () =>
    fields
      ? customerRoute.action(
          args(signedOutRequest(`/q/${token}`, { method: "POST", body: form(fields) }), { token }),
        )
      : customerRoute.loader(args(signedOutRequest(`/q/${token}`), { token })),
  );

/** Delivers an event the fake recorded to our webhook route, as the service would. */
async function deliver(payload: string, signature: string) {
  const res = (await webhook.action(
    args(
      new Request("http://127.0.0.1/api/webhooks/payments", {
        method: "POST",
        headers: { "Content-Type": "application/json", "Stripe-Signature": signature },
        body: payload,
      }),
    ),
  )) as Response;
  return { status: res.status, body: (await res.json()) as { outcome?: string; error?: string } };
}
const eventsOf = (type: string) => fake.events.filter((e) => e.type === type);

async function tokenFor(id: number): Promise<string> {
  const mail = await db
    .selectFrom("mail_messages")
    .select("text_body")
    .where("idempotency_key", "like", "quote:%")
    .where("to_address", "=", `rider-${tag}-${id}@mail.test`)
    .orderBy("id", "desc")
    .executeTakeFirstOrThrow();
  const m = /\/q\/([\w.-]+)/.exec(mail.text_body);
  return m![1];
}

async function payerChooses(checkoutUrl: string, outcome: "succeed" | "decline" | "cancel") {
  return fetch(checkoutUrl, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: `outcome=${outcome}`,
    redirect: "manual",
  });
}

beforeAll(async () => {
  await ensureBuiltInCategories(db);
  [owner, writer, apprentice] = await Promise.all([
    createTestUser(db, "owner"),
    createTestUser(db, "service_writer"),
    createTestUser(db, "apprentice"),
  ]);
  const shop = await db
    .selectFrom("shop")
    .select(["labour_rate_cents", "tax_rate_bp"])
    .orderBy("id")
    .executeTakeFirst();
  if (!shop)
    await db
      .insertInto("shop")
      .values({
        name: "Test shop",
        city: "Testville",
        phone: "555-0100",
        email: "shop@shop.test",
        labour_rate_cents: 12500,
        tax_rate_bp: 825,
      })
      .execute();
  const s = await db
    .selectFrom("shop")
    .select(["labour_rate_cents", "tax_rate_bp"])
    .orderBy("id")
    .executeTakeFirstOrThrow();
  labourRate = s.labour_rate_cents;
  taxBp = s.tax_rate_bp;
  await addPart("cyl", "cylinders", 129000, 2, { boreMm: 104.8 });
  await addPart("head", "heads", 180000, 3, { chamberCc: 89 });
  await addPart("fly", "flywheels", 245000, 6, { strokeMm: 114.3 });
  // a job covering this test's own made-up slot pair would clash with other tests' jobs,
  // so the test's job covers cylinder and head under a unique name
  await db
    .insertInto("labour_jobs")
    .values({
      name: `Top end ${tag}`,
      hours_hundredths: 800,
      slots: ["cylinder", "head", "piston", "gasket"],
      updated_by: owner.id,
    })
    .execute();
  packageId = await newPackage("main", null);
  const bike = await db
    .selectFrom("packages")
    .select("bike_id")
    .where("id", "=", packageId)
    .executeTakeFirstOrThrow();
  const cust = await db
    .selectFrom("bikes")
    .select("customer_id")
    .where("id", "=", bike.bike_id!)
    .executeTakeFirstOrThrow();
  await db
    .updateTable("customers")
    .set({ email: `rider-${tag}-${packageId}@mail.test` })
    .where("id", "=", cust.customer_id)
    .execute();
});

afterAll(async () => {
  await db.deleteFrom("labour_jobs").where("name", "=", `Top end ${tag}`).execute();
  await stopJobs();
  await fake.stop();
});

describe("pricing a package", () => {
  it("parts of the changed slots, the cheapest jobs covering them, a part's own hours where no job does", async () => {
    const out = await quoteLoader(writer, packageId);
    expect(out.status).toBe(200);
    const lines = out.value.priced.lines as {
      kind: string;
      description: string;
      quantityHundredths: number;
      unitCents: number;
    }[];
    const parts = lines
      .filter((l) => l.kind === "part")
      .map((l) => l.unitCents)
      .sort((a, b) => a - b);
    expect(parts).toEqual([129000, 180000, 245000]);
    const labour = lines.filter((l) => l.kind === "labour");
    // the cylinder and head are fitted in one job (8 h), not 2 h + 3 h on their own;
    // no job covers the flywheel, so its own 6 h apply. Other tests' jobs may also cover
    // cylinder and head, but never more cheaply than 8 h for both (they are made alike).
    const flywheel = labour.find((l) => l.description === `Fit Quote test fly`);
    expect(flywheel?.quantityHundredths).toBe(600);
    expect(
      labour.some(
        (l) => l.description === "Fit Quote test cyl" || l.description === "Fit Quote test head",
      ),
    ).toBe(false);
    const totals = out.value.priced.totals;
    const lineSum = lines.reduce(
      (s, l) => s + Math.round((l.quantityHundredths * l.unitCents) / 100),
      0,
    );
    expect(totals.subtotalCents).toBe(lineSum + (totals.supplies?.amountCents ?? 0));
    expect(totals.totalCents).toBe(totals.subtotalCents - totals.discountCents + totals.taxCents);
    expect(labour.every((l) => l.unitCents === labourRate)).toBe(true);
  });

  it("is refused to an apprentice, loader and action", async () => {
    expect((await quoteLoader(apprentice, packageId)).status).toBe(403);
    expect(
      (
        await quoteAction(apprentice, packageId, {
          intent: "terms",
          discountKind: "none",
          depositKind: "shop",
        })
      ).status,
    ).toBe(403);
  });

  it("adds machine work; a bad quantity is refused beside its field and saves nothing", async () => {
    const bad = await quoteAction(writer, packageId, {
      intent: "add-line",
      kind: "machine",
      description: "Bore and hone",
      quantity: "two",
      unit: "185",
    });
    expect(bad.status).toBe(400);
    expect(bad.value.result.error.quantity).toEqual([
      "Enter a quantity above 0 with at most two decimals, e.g. 1 or 2.5.",
    ]);
    expect(bad.value.result.initialValue.description).toBe("Bore and hone");
    expect(
      await db
        .selectFrom("quote_drafts")
        .select("package_id")
        .where("package_id", "=", packageId)
        .executeTakeFirst(),
    ).toBeUndefined();
    const ok = await quoteAction(writer, packageId, {
      intent: "add-line",
      kind: "machine",
      description: "Bore and hone",
      quantity: "1",
      unit: "185.00",
    });
    expect(ok.status).toBe(200);
    const after = await quoteLoader(writer, packageId);
    const machine = after.value.priced.lines.filter((l: { kind: string }) => l.kind === "machine");
    expect(machine).toEqual([
      expect.objectContaining({
        description: "Bore and hone",
        quantityHundredths: 100,
        unitCents: 18500,
        taxable: false,
      }),
    ]);
  });

  it("a percentage deposit of 30 % is 30 % of the total, rounded once", async () => {
    const out = await quoteAction(writer, packageId, {
      intent: "terms",
      discountKind: "none",
      depositKind: "percent",
      depositValue: "30",
    });
    expect(out.status).toBe(200);
    const t = (await quoteLoader(writer, packageId)).value.priced.totals;
    expect(t.depositCents).toBe(Math.round((t.totalCents * 3000) / 10000));
    expect(taxBp).toBeGreaterThanOrEqual(0);
  });
});

describe("send, the customer's link, approval and the deposit", () => {
  let token = "";
  let checkoutUrl = "";

  it("sending freezes quote 1, moves the package to quoted and e-mails a link", async () => {
    const out = await quoteAction(writer, packageId, { intent: "send" });
    expect(out.status).toBe(200);
    expect(out.value.message).toBe(`Quote 1 sent to rider-${tag}-${packageId}@mail.test.`);
    const pkg = await db
      .selectFrom("packages")
      .select("status")
      .where("id", "=", packageId)
      .executeTakeFirstOrThrow();
    expect(pkg.status).toBe("quoted");
    token = await tokenFor(packageId);
    const change = await db
      .selectFrom("package_status_changes")
      .select(["from_status", "to_status", "reason"])
      .where("package_id", "=", packageId)
      .orderBy("id", "desc")
      .executeTakeFirstOrThrow();
    expect(change).toEqual({ from_status: "draft", to_status: "quoted", reason: "Quote sent" });
  });

  it("the link shows the frozen quote; a tampered link shows a clear page and no quote", async () => {
    const ok = await customer(token);
    expect(ok.status).toBe(200);
    expect(ok.value.quote.number).toBe(1);
    const tampered = token.slice(0, -2) + (token.endsWith("A") ? "BB" : "AA");
    const bad = await customer(tampered);
    expect(bad.status).toBe(404);
    expect(bad.value.quote).toBeNull();
    expect(bad.value.problem).toMatch(/^This quote link is not valid\./);
    const refused = await customer(tampered, { intent: "approve" });
    expect(refused.status).toBe(410);
    expect(
      await db.selectFrom("payments").select("id").where("package_id", "=", packageId).execute(),
    ).toEqual([]);
  });

  it("approving starts a checkout for the deposit and sends the customer to it", async () => {
    const out = await customer(token, { intent: "approve" });
    expect(out.status).toBe(302);
    checkoutUrl = out.location!;
    expect(checkoutUrl.startsWith(`${fake.url}/checkout/cs_test_`)).toBe(true);
    const pay = await db
      .selectFrom("payments")
      .selectAll()
      .where("package_id", "=", packageId)
      .executeTakeFirstOrThrow();
    expect(pay.status).toBe("open");
    const v = await db
      .selectFrom("quote_versions")
      .select(["deposit_cents", "approved_at"])
      .where("package_id", "=", packageId)
      .executeTakeFirstOrThrow();
    expect(Number(pay.amount_cents)).toBe(Number(v.deposit_cents));
    expect(v.approved_at).not.toBeNull();
  });

  it("a declined card is recorded as declined and nothing moves", async () => {
    const res = await payerChooses(checkoutUrl, "decline");
    expect(res.status).toBe(200);
    expect(await res.text()).toContain("Your card was declined.");
    const [e] = eventsOf("payment_intent.payment_failed");
    expect((await deliver(e.payload, e.signature)).body.outcome).toBe("applied");
    const pay = await db
      .selectFrom("payments")
      .select(["status", "failure"])
      .where("package_id", "=", packageId)
      .executeTakeFirstOrThrow();
    expect(pay).toEqual({ status: "declined", failure: "Your card was declined." });
    expect(
      (
        await db
          .selectFrom("packages")
          .select("status")
          .where("id", "=", packageId)
          .executeTakeFirstOrThrow()
      ).status,
    ).toBe("quoted");
  });

  it("a forged webhook gets 400 and records nothing", async () => {
    const [e] = eventsOf("payment_intent.payment_failed");
    const forged = await deliver(e.payload.replace("declined", "approved!"), e.signature);
    expect(forged.status).toBe(400);
    const wrongKey = await deliver(
      e.payload,
      e.signature.replace(/v1=\w+/, `v1=${"0".repeat(64)}`),
    );
    expect(wrongKey.status).toBe(400);
    const noSig = (await webhook.action(
      args(
        new Request("http://127.0.0.1/api/webhooks/payments", { method: "POST", body: e.payload }),
      ),
    )) as Response;
    expect(noSig.status).toBe(400);
    const rows = await db
      .selectFrom("payment_events")
      .select("event_id")
      .where("event_id", "=", e.id)
      .execute();
    expect(rows).toHaveLength(1); // only the genuine delivery above
  });

  it("paying moves the package to approved once, however often the event comes, and e-mails a receipt", async () => {
    const res = await payerChooses(checkoutUrl, "succeed");
    expect(res.status).toBe(303);
    expect(res.headers.get("location")!.endsWith(`/q/${token}?deposit=paid`)).toBe(true);
    const completed = eventsOf("checkout.session.completed").find(
      (e) => (e.data.object as { url: string }).url === checkoutUrl,
    )!;
    expect((await deliver(completed.payload, completed.signature)).body.outcome).toBe("applied");
    expect((await deliver(completed.payload, completed.signature)).body.outcome).toBe("duplicate");
    const pays = await db
      .selectFrom("payments")
      .select(["status", "payment_intent_id"])
      .where("package_id", "=", packageId)
      .execute();
    expect(pays).toHaveLength(1);
    expect(pays[0].status).toBe("paid");
    expect(
      (
        await db
          .selectFrom("packages")
          .select("status")
          .where("id", "=", packageId)
          .executeTakeFirstOrThrow()
      ).status,
    ).toBe("approved");
    const receipts = await db
      .selectFrom("mail_messages")
      .select("subject")
      .where("idempotency_key", "like", "deposit-receipt:%")
      .where("to_address", "=", `rider-${tag}-${packageId}@mail.test`)
      .execute();
    expect(receipts).toHaveLength(1);
    const page = await customer(token);
    expect(page.value.paid).toBe(true);
    const again = await customer(token, { intent: "pay" });
    expect(again.value.message).toBe("The deposit for this quote is already paid. Thank you.");
  });

  it("the owner refunds; the refund event records it once", async () => {
    const [p] = await db
      .selectFrom("payments")
      .select(["id", "amount_cents"])
      .where("package_id", "=", packageId)
      .execute();
    const byWriter = await quoteAction(writer, packageId, {
      intent: "refund",
      payment: String(p.id),
    });
    expect(byWriter.status).toBe(403);
    const out = await quoteAction(owner, packageId, { intent: "refund", payment: String(p.id) });
    expect(out.status).toBe(200);
    const refund = eventsOf("refund.created").at(-1)!;
    expect((await deliver(refund.payload, refund.signature)).body.outcome).toBe("applied");
    expect((await deliver(refund.payload, refund.signature)).body.outcome).toBe("duplicate");
    const after = await db
      .selectFrom("payments")
      .select(["status", "refunded_cents"])
      .where("id", "=", p.id)
      .executeTakeFirstOrThrow();
    expect(after).toEqual({ status: "refunded", refunded_cents: p.amount_cents });
  });
});

describe("out of order, outages and old links", () => {
  it("a refund that arrives before its payment is held, then applied in order", async () => {
    const id = await newPackage("order", `rider-${tag}-x@mail.test`);
    const cust = await db
      .selectFrom("packages as p")
      .innerJoin("bikes as b", "b.id", "p.bike_id")
      .select("b.customer_id")
      .where("p.id", "=", id)
      .executeTakeFirstOrThrow();
    await db
      .updateTable("customers")
      .set({ email: `rider-${tag}-${id}@mail.test` })
      .where("id", "=", cust.customer_id)
      .execute();
    expect((await quoteAction(writer, id, { intent: "send" })).status).toBe(200);
    const token = await tokenFor(id);
    const url = (await customer(token, { intent: "approve" })).location!;
    await payerChooses(url, "succeed");
    const completed = eventsOf("checkout.session.completed").find(
      (e) => (e.data.object as { url: string }).url === url,
    )!;
    const intent = (completed.data.object as { payment_intent: string }).payment_intent;
    // the service refunds 1.00 before our app has heard of the payment
    const r = await fetch(`${fake.url}/v1/refunds`, {
      method: "POST",
      headers: {
        Authorization: "Bearer sk_test_quotes",
        "Content-Type": "application/x-www-form-urlencoded",
      },
      body: `payment_intent=${intent}&amount=100`,
    });
    expect(r.status).toBe(200);
    const refund = eventsOf("refund.created").at(-1)!;
    expect((await deliver(refund.payload, refund.signature)).body.outcome).toBe("held");
    expect((await deliver(completed.payload, completed.signature)).body.outcome).toBe("applied");
    const pay = await db
      .selectFrom("payments")
      .select(["status", "refunded_cents"])
      .where("package_id", "=", id)
      .executeTakeFirstOrThrow();
    expect(pay).toEqual({ status: "partly_refunded", refunded_cents: 100 });
    const held = await db
      .selectFrom("payment_events")
      .select("outcome")
      .where("event_id", "=", refund.id)
      .executeTakeFirstOrThrow();
    expect(held.outcome).toBe("applied");
  });

  it("with the payment service down, paying says so and records nothing; it works after", async () => {
    const id = await newPackage("down", null);
    const cust = await db
      .selectFrom("packages as p")
      .innerJoin("bikes as b", "b.id", "p.bike_id")
      .select("b.customer_id")
      .where("p.id", "=", id)
      .executeTakeFirstOrThrow();
    await db
      .updateTable("customers")
      .set({ email: `rider-${tag}-${id}@mail.test` })
      .where("id", "=", cust.customer_id)
      .execute();
    expect((await quoteAction(writer, id, { intent: "send" })).status).toBe(200);
    const token = await tokenFor(id);
    await fetch(`${fake.url}/_local/down`, {
      method: "POST",
      body: JSON.stringify({ down: true }),
    });
    try {
      const out = await customer(token, { intent: "approve" });
      expect(out.status).toBe(503);
      expect(out.value.message).toBe(SERVICE_DOWN);
      expect(
        await db.selectFrom("payments").select("id").where("package_id", "=", id).execute(),
      ).toEqual([]);
    } finally {
      await fetch(`${fake.url}/_local/down`, {
        method: "POST",
        body: JSON.stringify({ down: false }),
      });
    }
    const retry = await customer(token, { intent: "pay" });
    expect(retry.status).toBe(302);
  });

  it("an expired or replaced link shows a clear page and changes nothing", async () => {
    const id = await newPackage("old", null);
    const cust = await db
      .selectFrom("packages as p")
      .innerJoin("bikes as b", "b.id", "p.bike_id")
      .select("b.customer_id")
      .where("p.id", "=", id)
      .executeTakeFirstOrThrow();
    await db
      .updateTable("customers")
      .set({ email: `rider-${tag}-${id}@mail.test` })
      .where("id", "=", cust.customer_id)
      .execute();
    await quoteAction(writer, id, { intent: "send" });
    const first = await tokenFor(id);
    await quoteAction(writer, id, { intent: "send" });
    const second = await tokenFor(id);
    expect(second).not.toBe(first);
    const old = await customer(first);
    expect(old.status).toBe(410);
    expect(old.value.problem).toMatch(/^This quote has been replaced by a newer one\./);
    await db
      .updateTable("quote_versions")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("package_id", "=", id)
      .where("status", "=", "sent")
      .execute();
    const expired = await customer(second, { intent: "approve" });
    expect(expired.status).toBe(410);
    expect(expired.value.message).toMatch(/^This quote has expired\./);
    expect(
      await db.selectFrom("payments").select("id").where("package_id", "=", id).execute(),
    ).toEqual([]);
  });
});

describe("the spec sheet and the quote as PDFs", () => {
  const pdfText = async (res: Response) => {
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
    return (await parser.getText()).text.replace(/\s+/g, " ");
  };

  it("the sheet carries the package's numbers in both unit systems, the parts and the cautions", async () => {
    const res = (await sheetPdf.loader(
      args(await requestAs(writer, `/packages/${packageId}/sheet.pdf`), { id: String(packageId) }),
    )) as Response;
    const text = await pdfText(res);
    expect(text).toContain(`Quote main ${tag}`);
    // bore 104.8 mm = 4.126 in (104.8 / 25.4 = 4.1260, exact inch of 1959)
    expect(text).toContain("4.126 in");
    expect(text).toContain("104.80 mm");
    // stroke 114.3 mm = 4.500 in
    expect(text).toContain("4.500 in");
    expect(text).toContain("Quote test fly (Q-");
    expect(text).toContain("Torque every fastener to the parts maker's instructions");
    expect(text).not.toContain("$"); // the technician's sheet carries no prices
  });

  it("the quote PDF carries the sent quote's total, and an apprentice cannot fetch it", async () => {
    const v = await db
      .selectFrom("quote_versions")
      .select(["total_cents"])
      .where("package_id", "=", packageId)
      .orderBy("number", "desc")
      .executeTakeFirstOrThrow();
    const res = (await quotePdf.loader(
      args(await requestAs(writer, `/packages/${packageId}/quote.pdf`), { id: String(packageId) }),
    )) as Response;
    const text = await pdfText(res);
    const total = new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(
      v.total_cents / 100,
    );
    expect(text).toContain(`Total ${total}`);
    const refused = await run(async () =>
      quotePdf.loader(
        args(await requestAs(apprentice, `/packages/${packageId}/quote.pdf`), {
          id: String(packageId),
        }),
      ),
    );
    expect(refused.status).toBe(403);
  });
});
