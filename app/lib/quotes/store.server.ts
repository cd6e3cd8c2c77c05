// Quotes in the database: the editable draft of each package, the numbered versions sent
// to the customer (frozen, with the package revision they price), and the customer's
// signed link to one version.
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { data } from "react-router";
import { z } from "zod";
import type { Db } from "../db.server";
import { env } from "../env.server";
import { hashSecret } from "../auth/session.server";
import { queueMail } from "../mail/mail.server";
import { getBenchState } from "../packages/store.server";
import { keepCheckForQuote } from "./keep-check-source.server";
import { buildQuoteLines, type BuiltLine, type ExtraLine, type QuotePart } from "./lines";
import {
  MoneyError,
  priceQuote,
  type Adjustment,
  type QuoteTerms,
  type QuoteTotals,
} from "./money";
import { moveStatus } from "./status.server";

export const AdjustmentSchema: z.ZodType<Adjustment> = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("none") }),
  z.object({ kind: z.literal("percent"), basisPoints: z.number().int().min(0).max(10_000) }),
  z.object({ kind: z.literal("fixed"), cents: z.number().int().min(0).max(100_000_000) }),
]);

export const ExtraLineSchema: z.ZodType<ExtraLine> = z.object({
  kind: z.enum(["machine", "other"]),
  description: z.string().min(1).max(200),
  quantityHundredths: z.number().int().min(1).max(100_000_000),
  unitCents: z.number().int().min(0).max(100_000_000),
  taxable: z.boolean(),
});

export type QuoteDraft = {
  extraLines: ExtraLine[];
  discount: Adjustment;
  /** null: the shop's default deposit */
  deposit: Adjustment | null;
  note: string;
  updatedAt: string | null;
};

export type QuoteSummary = {
  packageName: string;
  bike: string | null;
  displacementCi: number | null;
  displacementCc: number | null;
  staticCr: number | null;
  dynamicCr: number | null;
  powerHp: number | null;
  powerBasis: string | null;
  cautions: string[];
  findings: { kind: string; message: string }[];
  changes: string[];
};

export type PricedQuoteLine = BuiltLine & { amountCents: number };

export type PricedQuote = {
  /** installed parts the keep-check marks "replace" that nothing on the quote replaces */
  unresolved: string[];
  lines: PricedQuoteLine[];
  totals: QuoteTotals;
  terms: QuoteTerms;
  changedSlots: string[];
  uncoveredSlots: string[];
  summary: QuoteSummary;
  revision: number;
};

export type QuoteVersionView = {
  id: number;
  packageId: number;
  number: number;
  packageRevision: number;
  lines: PricedQuoteLine[];
  totals: Omit<QuoteTotals, "lines">;
  terms: QuoteTerms;
  summary: QuoteSummary;
  customerName: string;
  customerEmail: string;
  status: string;
  expiresAt: string;
  sentAt: string;
  sentBy: string | null;
  approvedAt: string | null;
};

function inTransaction<T>(db: Db, fn: (trx: Db) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db) : db.transaction().execute((trx) => fn(trx));
}

const DEFAULT_DRAFT: QuoteDraft = {
  extraLines: [],
  discount: { kind: "none" },
  deposit: null,
  note: "",
  updatedAt: null,
};

export async function getQuoteSettings(db: Db) {
  const shop = await db
    .selectFrom("shop")
    .select([
      "labour_rate_cents",
      "tax_rate_bp",
      "deposit_kind",
      "deposit_value",
      "name",
      "email",
      "phone",
      "time_zone",
    ])
    .orderBy("id")
    .executeTakeFirst();
  if (!shop)
    throw data(
      "The shop's settings are not saved yet; the owner enters them under Settings before a quote is priced.",
      { status: 409 },
    );
  const q = await db
    .selectFrom("quote_settings")
    .select(["supplies_bp", "valid_days"])
    .where("id", "=", 1)
    .executeTakeFirst();
  const deposit: Adjustment =
    shop.deposit_kind === "fixed"
      ? { kind: "fixed", cents: shop.deposit_value }
      : { kind: "percent", basisPoints: shop.deposit_value };
  return {
    shopName: shop.name,
    shopEmail: shop.email,
    shopPhone: shop.phone,
    timeZone: shop.time_zone,
    labourRateCents: shop.labour_rate_cents,
    taxRateBasisPoints: shop.tax_rate_bp,
    deposit,
    suppliesBasisPoints: q?.supplies_bp ?? 0,
    validDays: q?.valid_days ?? 14,
  };
}

export async function getDraft(db: Db, packageId: number): Promise<QuoteDraft> {
  const row = await db
    .selectFrom("quote_drafts")
    .selectAll()
    .where("package_id", "=", packageId)
    .executeTakeFirst();
  if (!row) return DEFAULT_DRAFT;
  const extra = z.array(ExtraLineSchema).safeParse(row.extra_lines);
  const discount = AdjustmentSchema.safeParse(row.discount);
  const deposit = row.deposit === null ? null : AdjustmentSchema.safeParse(row.deposit);
  return {
    extraLines: extra.success ? extra.data : [],
    discount: discount.success ? discount.data : { kind: "none" },
    deposit: deposit && deposit.success ? deposit.data : null,
    note: row.note,
    updatedAt: new Date(row.updated_at).toISOString(),
  };
}

export async function saveDraft(
  db: Db,
  packageId: number,
  draft: Omit<QuoteDraft, "updatedAt">,
  userId: number,
): Promise<void> {
  const values = {
    extra_lines: JSON.stringify(draft.extraLines),
    discount: JSON.stringify(draft.discount),
    deposit: draft.deposit ? JSON.stringify(draft.deposit) : null,
    note: draft.note,
    updated_by: userId,
    updated_at: new Date(),
  };
  await db
    .insertInto("quote_drafts")
    .values({ package_id: packageId, ...values })
    .onConflict((oc) => oc.column("package_id").doUpdateSet(values))
    .execute();
}

async function partsForQuote(db: Db, ids: number[]): Promise<Map<number, QuotePart>> {
  if (ids.length === 0) return new Map();
  const rows = await db
    .selectFrom("parts")
    .select(["id", "part_number", "name", "maker", "price_cents", "labour_hours", "stock"])
    .where("id", "in", ids)
    .execute();
  return new Map(
    rows.map((r) => [
      r.id,
      {
        id: r.id,
        partNumber: r.part_number,
        name: r.name,
        maker: r.maker,
        priceCents: r.price_cents,
        labourHundredths: Math.round(Number(r.labour_hours) * 100),
        stock: r.stock,
      },
    ]),
  );
}

/** Prices the package as it stands now, with its draft's added lines and terms. */
export async function priceCurrent(db: Db, packageId: number): Promise<PricedQuote | null> {
  const [bench, header, settings, draft, jobs, keep] = await Promise.all([
    getBenchState(db, packageId, true),
    db
      .selectFrom("packages as p")
      .leftJoin("bikes as b", "b.id", "p.bike_id")
      .select(["p.name", "p.power_hp", "p.power_basis", "b.year", "b.model"])
      .where("p.id", "=", packageId)
      .executeTakeFirst(),
    getQuoteSettings(db),
    getDraft(db, packageId),
    db
      .selectFrom("labour_jobs")
      .select(["id", "name", "hours_hundredths", "slots"])
      .where("active", "=", true)
      .orderBy("id")
      .execute(),
    keepCheckForQuote(db, packageId),
  ]);
  if (!bench || !header) return null;
  const slotPartIds = Object.entries(bench.spec.slots)
    .filter(([, fill]) => fill.partId !== null)
    .map(([slot, fill]) => [slot, fill.partId!] as const);
  const parts = await partsForQuote(db, [
    ...slotPartIds.map(([, id]) => id),
    ...keep.replace.map((r) => r.partId),
  ]);
  const built = buildQuoteLines({
    slots: Object.fromEntries(slotPartIds.map(([slot, id]) => [slot, parts.get(id) ?? null])),
    baseline: keep.baseline,
    replaceParts: keep.replace
      .filter((r) => parts.has(r.partId))
      .map((r) => ({ slot: r.slot, part: parts.get(r.partId)!, reason: r.reason })),
    jobs: jobs.map((j) => ({
      id: j.id,
      name: j.name,
      hoursHundredths: j.hours_hundredths,
      slots: j.slots,
    })),
    labourRateCents: settings.labourRateCents,
    extraLines: draft.extraLines,
  });
  const terms: QuoteTerms = {
    taxRateBasisPoints: settings.taxRateBasisPoints,
    discount: draft.discount,
    deposit: draft.deposit ?? settings.deposit,
    suppliesBasisPoints: settings.suppliesBasisPoints,
  };
  const totals = priceQuote(built.lines, terms);
  const r = bench.computation.results;
  return {
    unresolved: keep.unresolved,
    lines: built.lines.map((l, i) => ({ ...l, amountCents: totals.lines[i]!.amountCents })),
    totals,
    terms,
    changedSlots: built.changedSlots,
    uncoveredSlots: built.uncoveredSlots,
    revision: bench.revision,
    summary: {
      packageName: header.name,
      bike: header.year ? `${header.year} ${header.model}` : null,
      displacementCi: r.displacementCi,
      displacementCc: r.displacementCc,
      staticCr: r.staticCr,
      dynamicCr: r.dynamicCr,
      powerHp: header.power_hp === null ? null : Number(header.power_hp),
      powerBasis: header.power_basis,
      cautions: bench.computation.cautions.map((c) => c.message),
      // a rule that could not be checked is the builder's business, not the customer's
      findings: bench.findings
        .filter((f) => !f.error)
        .map((f) => ({ kind: f.kind, message: f.message })),
      changes: built.lines
        .filter((l) => l.kind === "part")
        .map((l) => `${l.source}: ${l.description}`),
    },
  };
}

// ---- the customer's link --------------------------------------------------------------

function signLink(value: string): string {
  return createHmac("sha256", env().SESSION_SECRET)
    .update(`quote:${value}`)
    .digest("base64url")
    .slice(0, 32);
}

export function quoteUrl(token: string): string {
  return `${env().APP_URL.replace(/\/$/, "")}/q/${token}`;
}

export type LinkProblem = "invalid" | "expired" | "superseded" | "withdrawn";

export const LINK_PROBLEMS: Record<LinkProblem, string> = {
  invalid:
    "This quote link is not valid. Check that the whole link was copied from the e-mail, or ask the shop to send it again.",
  expired: "This quote has expired. Ask the shop for a new one; prices and parts may have changed.",
  superseded:
    "This quote has been replaced by a newer one. Open the link in the shop's latest e-mail.",
  withdrawn: "The shop has withdrawn this quote. Call the shop if you have questions.",
};

export async function checkQuoteLink(
  db: Db,
  token: string,
  now = new Date(),
): Promise<{ ok: true; versionId: number } | { ok: false; reason: LinkProblem }> {
  const [value, signature] = token.split(".");
  if (!value || !signature || token.length > 200) return { ok: false, reason: "invalid" };
  const expected = Buffer.from(signLink(value));
  const given = Buffer.from(signature);
  if (expected.length !== given.length || !timingSafeEqual(expected, given))
    return { ok: false, reason: "invalid" };
  const row = await db
    .selectFrom("quote_versions")
    .select(["id", "status", "expires_at"])
    .where("token_hash", "=", hashSecret(value))
    .executeTakeFirst();
  if (!row) return { ok: false, reason: "invalid" };
  if (row.status === "superseded") return { ok: false, reason: "superseded" };
  if (row.status === "withdrawn") return { ok: false, reason: "withdrawn" };
  if (row.status !== "approved" && new Date(row.expires_at) <= now)
    return { ok: false, reason: "expired" };
  return { ok: true, versionId: row.id };
}

type VersionRow = Awaited<ReturnType<typeof selectVersions>>[number];

function toVersionView(r: VersionRow): QuoteVersionView {
  const totals = {
    supplies: null,
    subtotalCents: Number(r.subtotal_cents),
    discountCents: Number(r.discount_cents),
    taxableCents: 0,
    taxCents: Number(r.tax_cents),
    totalCents: Number(r.total_cents),
    depositCents: Number(r.deposit_cents),
    ...((r.terms as { totals?: object }).totals ?? {}),
  };
  return {
    id: r.id,
    packageId: r.package_id,
    number: r.number,
    packageRevision: r.package_revision,
    lines: r.lines as PricedQuoteLine[],
    totals,
    terms: (r.terms as { terms: QuoteTerms }).terms,
    summary: r.summary as QuoteSummary,
    customerName: r.customer_name,
    customerEmail: r.customer_email,
    status: r.status,
    expiresAt: new Date(r.expires_at).toISOString(),
    sentAt: new Date(r.sent_at).toISOString(),
    sentBy: r.sent_by_name,
    approvedAt: r.approved_at ? new Date(r.approved_at).toISOString() : null,
  };
}

async function selectVersions(db: Db, where: { packageId?: number; id?: number }) {
  let q = db
    .selectFrom("quote_versions as q")
    .leftJoin("users as u", "u.id", "q.sent_by")
    .selectAll("q")
    .select("u.name as sent_by_name");
  if (where.packageId !== undefined) q = q.where("q.package_id", "=", where.packageId);
  if (where.id !== undefined) q = q.where("q.id", "=", where.id);
  return q.orderBy("q.number", "desc").execute();
}

export async function listVersions(db: Db, packageId: number): Promise<QuoteVersionView[]> {
  return (await selectVersions(db, { packageId })).map(toVersionView);
}

export async function getVersion(db: Db, id: number): Promise<QuoteVersionView | null> {
  const [row] = await selectVersions(db, { id });
  return row ? toVersionView(row) : null;
}

export type SendOutcome =
  | { ok: true; version: QuoteVersionView; link: string }
  | { ok: false; field: string; message: string };

/**
 * Freezes the package's current quote as the next numbered version, supersedes the one
 * before, e-mails the customer a signed, expiring link, and moves a draft to quoted.
 */
export async function sendQuote(
  db: Db,
  packageId: number,
  userId: number,
  now = new Date(),
  /** the demo seed freezes quotes of packages already past "quoted", without mail */
  opts: { mail?: boolean; anyStatus?: boolean } = {},
): Promise<SendOutcome> {
  return inTransaction(db, async (trx) => {
    const pkg = await trx
      .selectFrom("packages as p")
      .leftJoin("bikes as b", "b.id", "p.bike_id")
      .leftJoin("customers as c", "c.id", "b.customer_id")
      .select([
        "p.id",
        "p.status",
        "p.is_template",
        "p.current_revision",
        "c.name as customer_name",
        "c.email as customer_email",
      ])
      .where("p.id", "=", packageId)
      .forUpdate("p")
      .executeTakeFirst();
    if (!pkg) return { ok: false, field: "form", message: "This package no longer exists." };
    if (pkg.is_template)
      return {
        ok: false,
        field: "form",
        message: "A shop template is not quoted; copy it into a package for a bike.",
      };
    if (pkg.status !== "draft" && pkg.status !== "quoted" && !opts.anyStatus)
      return {
        ok: false,
        field: "form",
        message: "Only a draft or quoted package can be sent; this one is already past its quote.",
      };
    if (!pkg.customer_email)
      return {
        ok: false,
        field: "form",
        message: "The customer has no e-mail address. Add one on the customer's page, then send.",
      };
    let priced: PricedQuote | null;
    try {
      priced = await priceCurrent(trx, packageId);
    } catch (e) {
      if (e instanceof MoneyError) return { ok: false, field: e.field, message: e.message };
      throw e;
    }
    if (!priced) return { ok: false, field: "form", message: "This package no longer exists." };
    if (priced.lines.length === 0)
      return {
        ok: false,
        field: "form",
        message: "The quote has no lines yet: fit parts on the bench or add a line.",
      };
    if (priced.totals.totalCents > 2_000_000_000_00)
      return { ok: false, field: "form", message: "The total is beyond what one quote can hold." };
    const last = await trx
      .selectFrom("quote_versions")
      .select(["id", "number", "package_revision", "lines", "status"])
      .where("package_id", "=", packageId)
      .orderBy("number", "desc")
      .executeTakeFirst();
    await trx
      .updateTable("quote_versions")
      .set({ status: "superseded" })
      .where("package_id", "=", packageId)
      .where("status", "in", ["sent", "changes_requested"])
      .execute();
    const settings = await getQuoteSettings(trx);
    const value = randomBytes(24).toString("base64url");
    const token = `${value}.${signLink(value)}`;
    const { lines: _l, ...totalsOnly } = priced.totals;
    const expiresAt = new Date(now.getTime() + settings.validDays * 24 * 3600 * 1000);
    const inserted = await trx
      .insertInto("quote_versions")
      .values({
        package_id: packageId,
        number: (last?.number ?? 0) + 1,
        package_revision: priced.revision,
        lines: JSON.stringify([
          ...priced.lines,
          ...(priced.totals.supplies
            ? [{ ...priced.totals.supplies, source: "Shop supplies", slot: null }]
            : []),
        ]),
        terms: JSON.stringify({ terms: priced.terms, totals: totalsOnly }),
        subtotal_cents: priced.totals.subtotalCents,
        discount_cents: priced.totals.discountCents,
        tax_cents: priced.totals.taxCents,
        total_cents: priced.totals.totalCents,
        deposit_cents: priced.totals.depositCents,
        summary: JSON.stringify(priced.summary),
        customer_name: pkg.customer_name ?? "",
        customer_email: pkg.customer_email,
        token_hash: hashSecret(value),
        expires_at: expiresAt,
        sent_by: userId,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    if (pkg.status === "draft")
      await moveStatus(trx, packageId, "draft", "quoted", userId, "Quote sent");
    const link = quoteUrl(token);
    const number = (last?.number ?? 0) + 1;
    if (opts.mail !== false)
      await queueMail(trx, {
        key: `quote:${inserted.id}`,
        to: pkg.customer_email,
        subject: `Your engine package quote from ${settings.shopName}`,
        text: [
          `Hello ${pkg.customer_name ?? ""},`.trim(),
          "",
          `Here is quote ${number} for "${priced.summary.packageName}"${priced.summary.bike ? ` on your ${priced.summary.bike}` : ""}.`,
          `Open it to see what we plan to do and why, approve it or ask for changes, and pay the deposit:`,
          "",
          link,
          "",
          `The link is for you alone and works until ${expiresAt.toLocaleDateString("en-US", { dateStyle: "long", timeZone: settings.timeZone })}.`,
          `Questions? Call us at ${settings.shopPhone} or reply to this e-mail.`,
          "",
          settings.shopName,
        ].join("\n"),
      });
    const version = await getVersion(trx, inserted.id);
    return { ok: true, version: version!, link };
  });
}

export async function recordCustomerMessage(
  db: Db,
  versionId: number,
  body: string,
): Promise<void> {
  await inTransaction(db, async (trx) => {
    const v = await trx
      .selectFrom("quote_versions")
      .select(["id", "package_id", "status"])
      .where("id", "=", versionId)
      .forUpdate()
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("customer_messages")
      .values({ package_id: v.package_id, quote_version_id: v.id, body })
      .execute();
    if (v.status === "sent")
      await trx
        .updateTable("quote_versions")
        .set({ status: "changes_requested" })
        .where("id", "=", v.id)
        .execute();
  });
}

export async function approveByCustomer(
  db: Db,
  versionId: number,
  now = new Date(),
): Promise<void> {
  await db
    .updateTable("quote_versions")
    .set({ approved_at: now })
    .where("id", "=", versionId)
    .where("approved_at", "is", null)
    .execute();
}

export async function listCustomerMessages(db: Db, packageId: number) {
  return db
    .selectFrom("customer_messages as m")
    .leftJoin("quote_versions as q", "q.id", "m.quote_version_id")
    .select(["m.id", "m.body", "m.created_at", "m.read_at", "q.number"])
    .where("m.package_id", "=", packageId)
    .orderBy("m.created_at", "desc")
    .execute();
}
