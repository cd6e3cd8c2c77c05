// Malformed bench posts are refused in the product's words, beside a field the bench
// shows (`slot`, `slot.field`, a package number) or under `form` — never under
// "undefined" and never in the validator's wording. A value of only spaces is refused
// (an empty box is what clears a value). Also: public forms expire, and /api/parts pages.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import {
  FORM_EXPIRED,
  HONEYPOT_LIFETIME_MS,
  HONEYPOT_STAMP,
  HONEYPOT_TRAP,
} from "~/lib/auth/honeypot";
import { honeypotStamp } from "~/lib/auth/honeypot.server";
import { ONLY_SPACES } from "~/lib/bench/intent.server";
import { MEASURED_FIELDS } from "~/lib/bench/spec";
import { getDb } from "~/lib/db.server";
import { SLOTS } from "~/lib/packages/slots";
import { signedOutRequest } from "../support/auth";
import { dispatch, hostileRequest, makeFixtures, type Fixtures } from "../support/hostile";

let f: Fixtures;
beforeAll(async () => {
  f = await makeFixtures();
});

const SLOT_KEYS = SLOTS.map((s) => s.key);
const NUMBER_FIELDS = ["deckClearanceMm", "revLimitRpm", "powerHp"];
const KEYS = new Set<string>([
  "form",
  ...SLOT_KEYS,
  ...NUMBER_FIELDS,
  ...SLOTS.flatMap((s) => MEASURED_FIELDS.map((m) => `${s.key}.${m}`)),
]);
const pickOr = <T extends string>(xs: readonly T[]) =>
  fc.oneof(fc.constantFrom(...xs), fc.string({ maxLength: 8 }), fc.constant(undefined));

const malformed = fc.record(
  {
    intent: pickOr([
      "set-part",
      "clear-slot",
      "set-measured",
      "revert-measured",
      "set-number",
      "set-basis",
      "bogus",
    ]),
    slot: pickOr(SLOT_KEYS),
    field: pickOr([...MEASURED_FIELDS, ...NUMBER_FIELDS]),
    value: pickOr(["", " ", "abc", "1e400", "12", "-", "4.1.2", "target"]),
    unit: pickOr(["mm", "in", "furlong"]),
    partId: pickOr(["0", "1.5", "x", "99999999999"]),
  },
  { requiredKeys: [] },
);

describe("malformed bench posts", () => {
  it("are refused in plain words under a key the bench shows", async () => {
    const path = `/packages/${f.packageId}/bench`;
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(malformed, async (fields) => {
        const body = new URLSearchParams();
        for (const [k, v] of Object.entries(fields)) if (v !== undefined) body.set(k, v);
        body.set("expectedRevision", "999999");
        const a = await dispatch(hostileRequest(f, "builder", path, { method: "POST", body }));
        expect(a.status, `${body}: ${a.message}`).toBeLessThan(500);
        if (a.status !== 400) return; // a well-formed post meets the stale check (409)
        refused++;
        const errors = (a.value as { errors: Record<string, string[]> }).errors;
        for (const [key, messages] of Object.entries(errors)) {
          expect(KEYS.has(key), `${body} → key ${key}`).toBe(true);
          for (const m of messages) {
            expect(m).not.toMatch(/undefined|Invalid|expected|discriminator|received/);
            expect(m.length).toBeGreaterThan(5);
          }
        }
      }),
      { numRuns: 150 },
    );
    expect(refused).toBeGreaterThanOrEqual(100);
  });

  it("a value of only spaces is refused beside its field; an empty box clears", async () => {
    const path = `/packages/${f.packageId}/bench`;
    let cases = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.stringMatching(/^[ \t]{1,6}$/),
        fc.constantFrom(...NUMBER_FIELDS),
        async (spaces, field) => {
          const body = new URLSearchParams({
            intent: "set-number",
            field,
            value: spaces,
            expectedRevision: "1",
          });
          const a = await dispatch(hostileRequest(f, "builder", path, { method: "POST", body }));
          expect(a.status).toBe(400);
          expect(a.value).toEqual({ ok: false, errors: { [field]: [ONLY_SPACES] } });
          cases++;
        },
      ),
      { numRuns: 20 },
    );
    expect(cases).toBe(20);
    const rev = (
      await getDb()
        .selectFrom("packages")
        .select("current_revision")
        .where("id", "=", f.packageId)
        .executeTakeFirstOrThrow()
    ).current_revision;
    const body = new URLSearchParams({
      intent: "set-number",
      field: "powerHp",
      value: "",
      expectedRevision: String(rev),
    });
    const cleared = await dispatch(hostileRequest(f, "builder", path, { method: "POST", body }));
    expect(cleared.status).toBe(200);
  });
});

describe("public forms expire", () => {
  it("a stamp older than its lifetime asks for a reload; a younger one is accepted", async () => {
    let expired = 0;
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 1000, max: 3 * HONEYPOT_LIFETIME_MS }), async (age) => {
        const body = new URLSearchParams({
          email: f.users.builder.email,
          password: "not-the-password",
          [HONEYPOT_TRAP]: "",
          [HONEYPOT_STAMP]: honeypotStamp(Date.now() - age).stamp,
        });
        const a = await dispatch(signedOutRequest("/login", { method: "POST", body }));
        if (age > HONEYPOT_LIFETIME_MS + 5000) {
          expect(a.status).toBe(400);
          expect(a.message).toContain(FORM_EXPIRED);
          expired++;
        } else if (age < HONEYPOT_LIFETIME_MS - 5000) {
          // past the stamp to the password check (wrong; held back after a few tries)
          expect([401, 429]).toContain(a.status);
        }
      }),
      { numRuns: 12 },
    );
    expect(expired).toBeGreaterThanOrEqual(3);
    // the request for a reset link says so too, instead of claiming a mail went out
    const reset = await dispatch(
      signedOutRequest("/reset", {
        method: "POST",
        body: new URLSearchParams({
          email: f.users.builder.email,
          [HONEYPOT_TRAP]: "",
          [HONEYPOT_STAMP]: honeypotStamp(Date.now() - HONEYPOT_LIFETIME_MS - 60_000).stamp,
        }),
      }),
    );
    expect(reset.status).toBe(400);
    expect(reset.message).toContain(FORM_EXPIRED);
  });
});

describe("/api/parts in pages", () => {
  it("answers the total and the address of the next page until the last", async () => {
    const db = getDb();
    await db
      .insertInto("parts")
      .values(
        [1, 2, 3, 4, 5].map((i) => ({
          part_number: `PG-${f.tag}-${i}`,
          category: "cams",
          maker: "Paging Works",
          name: `Paging cam ${f.tag} ${i}`,
          price_cents: 100,
          tags: [],
          stock: false,
          attributes: JSON.stringify({}),
        })),
      )
      .execute();
    const seen: string[] = [];
    let next: string | null = `/api/parts?q=PG-${f.tag}&limit=2`;
    let pages = 0;
    while (next) {
      const a = await dispatch(hostileRequest(f, "builder", next));
      expect(a.status).toBe(200);
      const json = JSON.parse(await (a.value as Response).text()) as {
        parts: { partNumber?: string; part_number?: string; name: string }[];
        total: number;
        offset: number;
        limit: number;
        next: string | null;
      };
      expect(json.total).toBe(5);
      expect(json.limit).toBe(2);
      expect(json.offset).toBe(pages * 2);
      seen.push(...json.parts.map((p) => p.name));
      next = json.next;
      pages++;
      expect(pages).toBeLessThanOrEqual(3);
    }
    expect(pages).toBe(3);
    expect(seen.sort()).toEqual([1, 2, 3, 4, 5].map((i) => `Paging cam ${f.tag} ${i}`).sort());
  });
});
