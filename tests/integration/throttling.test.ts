// Sign-in throttling through the real sign-in route: failures are counted per account
// and address pair (growing delays: a minute, then two, four, … up to the window), per
// account across addresses (only unfamiliar addresses wait, so a stranger cannot keep
// the owner out) and per address; a 429 carries Retry-After as far as the browser.
import { randomBytes } from "node:crypto";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import {
  CLIENT_ADDRESS_HEADER,
  FIRST_DELAY_SECONDS,
  growingDelay,
  MAX_ACCOUNT_FAILURES,
  MAX_ADDRESS_FAILURES,
  MAX_PAIR_FAILURES,
  secondsUntilAllowed,
  THROTTLE_WINDOW_SECONDS,
} from "~/lib/auth/throttle.server";
import { headers } from "~/routes/login";
import { createTestUser, form, signedOutRequest, type TestUser } from "../support/auth";
import { asFromPage } from "../support/honeypot";
import { dispatch } from "../support/hostile";

const db = getDb();
const addr = (name: string) => `198.51.100.${name}-${randomBytes(3).toString("hex")}`;

/** A sign-in through the route table, from `ip` (as scripts/serve.mjs reports it). */
function signIn(user: TestUser, password: string, ip: string) {
  return dispatch(
    signedOutRequest("/login", {
      method: "POST",
      body: form(asFromPage({ email: user.email, password })),
      headers: { [CLIENT_ADDRESS_HEADER]: ip },
    }),
  );
}

/** Failures written straight into the table, `agoSeconds` old (oldest first). */
async function failures(email: string, ip: string, n: number, agoSeconds = 0) {
  if (n === 0) return;
  await db
    .insertInto("login_attempts")
    .values(
      Array.from({ length: n }, () => ({
        email: email.toLowerCase(),
        ip,
        succeeded: false,
        created_at: new Date(Date.now() - agoSeconds * 1000),
      })),
    )
    .execute();
}

describe("growing delays for one account from one address", () => {
  it("wait a minute after five failures, doubling after each further one, never past the window", async () => {
    let delayed = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: 14 }),
        fc.integer({ min: 1, max: 20 * 60 }),
        async (n, ago) => {
          const email = `pair-${randomBytes(4).toString("hex")}@crew.test`;
          const ip = addr("7");
          await failures(email, ip, n, ago);
          const wait = await secondsUntilAllowed(db, email, ip);
          const delay = growingDelay(n, MAX_PAIR_FAILURES);
          const expected = ago > THROTTLE_WINDOW_SECONDS ? 0 : Math.max(0, delay - ago);
          expect(Math.abs(wait - expected), `${n} failures ${ago}s ago`).toBeLessThanOrEqual(2);
          if (n >= MAX_PAIR_FAILURES && wait > 0) {
            delayed++;
            expect(wait).toBeLessThanOrEqual(THROTTLE_WINDOW_SECONDS);
          }
          // another address of the same account is not held back by these
          expect(await secondsUntilAllowed(db, email, addr("8"))).toBe(0);
        },
      ),
      { numRuns: 60 },
    );
    expect(growingDelay(MAX_PAIR_FAILURES, MAX_PAIR_FAILURES)).toBe(FIRST_DELAY_SECONDS);
    expect(growingDelay(MAX_PAIR_FAILURES + 2, MAX_PAIR_FAILURES)).toBe(4 * FIRST_DELAY_SECONDS);
    expect(growingDelay(MAX_PAIR_FAILURES + 9, MAX_PAIR_FAILURES)).toBe(THROTTLE_WINDOW_SECONDS);
    expect(delayed).toBeGreaterThanOrEqual(10);
  });
});

describe("a stranger guessing the owner's password", () => {
  it("never keeps the owner out of a known-good address", async () => {
    const owner = await createTestUser(db, "owner");
    const home = addr("10");
    expect((await signIn(owner, owner.password, home)).status).toBe(302);
    let strangerHeld = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 1, max: 6 }),
        async (perAddress, addresses) => {
          const strangers = Array.from({ length: addresses }, (_, i) => addr(`${20 + i}`));
          for (const ip of strangers) await failures(owner.email, ip, perAddress);
          // one real try by the first stranger: held back once it has failed often enough
          const s = await signIn(owner, "guess-again", strangers[0]!);
          if (perAddress >= MAX_PAIR_FAILURES) {
            expect(s.status).toBe(429);
            strangerHeld++;
          } else expect([401, 429]).toContain(s.status);
          // the owner, from home, with the right password: straight in
          const o = await signIn(owner, owner.password, home);
          expect(o.status, `${addresses}×${perAddress} failures elsewhere`).toBe(302);
          // an unfamiliar address waits once the account has many failures everywhere
          const fresh = await secondsUntilAllowed(db, owner.email, addr("99"));
          if (addresses * perAddress + 1 >= MAX_ACCOUNT_FAILURES) expect(fresh).toBe(0);
          // (the owner's success just now restarted the account's count)
        },
      ),
      { numRuns: 15 },
    );
    expect(strangerHeld).toBeGreaterThanOrEqual(5);
  });

  it("an account failing from many addresses makes unfamiliar addresses wait, not familiar ones", async () => {
    const user = await createTestUser(db, "builder");
    const home = addr("30");
    expect((await signIn(user, user.password, home)).status).toBe(302);
    for (let i = 0; i < MAX_ACCOUNT_FAILURES; i++) await failures(user.email, addr(`${40 + i}`), 1);
    expect(await secondsUntilAllowed(db, user.email, addr("98"))).toBeGreaterThan(
      FIRST_DELAY_SECONDS - 5,
    );
    expect(await secondsUntilAllowed(db, user.email, home)).toBe(0);
  });

  it("one address failing for many accounts waits, whichever account it tries next", async () => {
    const ip = addr("50");
    for (let i = 0; i < MAX_ADDRESS_FAILURES; i++)
      await failures(`spray-${i}-${randomBytes(2).toString("hex")}@crew.test`, ip, 1);
    const user = await createTestUser(db, "apprentice");
    const r = await signIn(user, user.password, ip);
    expect(r.status).toBe(429);
    expect(Number(r.headers?.get("Retry-After"))).toBeGreaterThan(14 * 60);
  });
});

describe("Retry-After", () => {
  it("is on the 429 and passed on by the route's headers", async () => {
    const user = await createTestUser(db, "builder");
    const ip = addr("60");
    for (let i = 0; i < MAX_PAIR_FAILURES; i++)
      expect((await signIn(user, `wrong-${i}`, ip)).status).toBe(401);
    const r = await signIn(user, user.password, ip);
    expect(r.status).toBe(429);
    const actionHeaders = r.headers!;
    const retry = Number(actionHeaders.get("Retry-After"));
    expect(retry).toBeGreaterThan(FIRST_DELAY_SECONDS - 5);
    expect(retry).toBeLessThanOrEqual(FIRST_DELAY_SECONDS);
    const passed = headers({
      actionHeaders,
      loaderHeaders: new Headers(),
      parentHeaders: new Headers(),
      errorHeaders: undefined,
    } as never) as Headers;
    expect(passed.get("Retry-After")).toBe(String(retry));
  });
});
