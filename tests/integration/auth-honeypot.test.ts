// The public forms (sign-in, reset request, invite, new password) carry honeypot fields
// checked on the server: a script that fills the trap, or posts without the page's
// stamp, gets the form's usual kind of answer and nothing is done.
import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import { FORM_NOT_FROM_PAGE, HONEYPOT_STAMP, HONEYPOT_TRAP } from "~/lib/auth/honeypot";
import { honeypotStamp, trippedHoneypot } from "~/lib/auth/honeypot.server";
import { createToken } from "~/lib/auth/tokens.server";
import * as invite from "~/routes/invite.$token";
import * as login from "~/routes/login";
import * as reset from "~/routes/reset";
import * as resetToken from "~/routes/reset.$token";
import { createTestUser, form, signedOutRequest } from "../support/auth";
import { asFromPage } from "../support/honeypot";
import { args, run } from "../support/route";

const db = getDb();
const unique = (p: string) => `${p}-${randomBytes(4).toString("hex")}@crew.test`;
const postTo = (path: string, fields: Record<string, string>) =>
  signedOutRequest(path, { method: "POST", body: form(fields) });

const fieldsFor = (stamp: string, trap = "") => ({
  [HONEYPOT_TRAP]: trap,
  [HONEYPOT_STAMP]: stamp,
});

describe("the honeypot check", () => {
  const good = honeypotStamp(Date.now() - 3000).stamp;
  it.each([
    ["a person's post", fieldsFor(good), false],
    ["a filled trap", fieldsFor(good, "https://spam.test"), true],
    ["no stamp", { [HONEYPOT_TRAP]: "" }, true],
    [
      "an altered stamp",
      fieldsFor(`${Number(good.split(".")[0]) - 1000}.${good.split(".")[1]}`),
      true,
    ],
    ["a stamp from the future", fieldsFor(honeypotStamp(Date.now() + 10 * 60_000).stamp), true],
    ["a stamp that is not one", fieldsFor("yesterday"), true],
  ] as const)("%s → tripped %s", (_, fields, tripped) => {
    expect(trippedHoneypot(toFormData(fields))).toBe(tripped);
  });

  it("every public page hands its form a stamp", async () => {
    expect(trippedHoneypot(toFormData(asFromPage({})))).toBe(false);
    const fromLogin = (await login.loader(args(signedOutRequest("/login")))) as { stamp: string };
    const fromReset = (await reset.loader(args(signedOutRequest("/reset")))) as { stamp: string };
    const fromInvite = await invite.loader(args(signedOutRequest("/invite/x"), { token: "x" }));
    const fromNewPassword = await resetToken.loader(
      args(signedOutRequest("/reset/x"), { token: "x" }),
    );
    for (const s of [fromLogin.stamp, fromReset.stamp, fromInvite.stamp, fromNewPassword.stamp]) {
      expect(trippedHoneypot(toFormData({ [HONEYPOT_TRAP]: "", [HONEYPOT_STAMP]: s }))).toBe(false);
    }
  });
});

function toFormData(fields: Record<string, string>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
}

describe("public forms refuse a script quietly", () => {
  it("sign-in: the right password with the trap filled signs nobody in", async () => {
    const user = await createTestUser(db, "builder");
    const fields = asFromPage({ email: user.email, password: user.password });
    const r = await run(() =>
      login.action(args(postTo("/login", { ...fields, [HONEYPOT_TRAP]: "x" }))),
    );
    expect(r.status).toBe(400);
    expect(r.value.result.error[""]).toEqual([FORM_NOT_FROM_PAGE]);
    const noStamp = await run(() =>
      login.action(args(postTo("/login", { email: user.email, password: user.password }))),
    );
    expect(noStamp.status).toBe(400);
    // nothing was counted against the account either
    const attempts = await db
      .selectFrom("login_attempts")
      .where("email", "=", user.email.toLowerCase())
      .selectAll()
      .execute();
    expect(attempts).toEqual([]);
    const ok = await run(() => login.action(args(postTo("/login", fields))));
    expect(ok.status).toBe(302);
  });

  it("reset request: the usual answer, and no link is made", async () => {
    const user = await createTestUser(db, "apprentice");
    const r = await run(() =>
      reset.action(
        args(postTo("/reset", { ...asFromPage({ email: user.email }), [HONEYPOT_TRAP]: "x" })),
      ),
    );
    expect(r.value.sent).toBe(true);
    const tokens = await db
      .selectFrom("auth_tokens")
      .where("user_id", "=", user.id)
      .selectAll()
      .execute();
    expect(tokens).toEqual([]);
  });

  it("invite: no account is made and the link still works for the person", async () => {
    const email = unique("invited");
    const { token, row } = await createToken(db, { kind: "invite", email, role: "builder" });
    const fields = {
      name: "Ines Marlow",
      password: "long-enough-pass",
      confirm: "long-enough-pass",
    };
    const r = await run(() => invite.action(args(postTo(`/invite/${token}`, fields), { token })));
    expect(r.status).toBe(400);
    expect(r.value.result.error[""]).toEqual([FORM_NOT_FROM_PAGE]);
    expect(
      await db.selectFrom("users").where("email", "=", email).selectAll().executeTakeFirst(),
    ).toBeUndefined();
    const after = await db
      .selectFrom("auth_tokens")
      .where("id", "=", row.id)
      .selectAll()
      .executeTakeFirstOrThrow();
    expect(after.used_at).toBeNull();
    const ok = await run(() =>
      invite.action(args(postTo(`/invite/${token}`, asFromPage(fields)), { token })),
    );
    expect(ok.status).toBe(302);
  });

  it("new password: the trap filled changes nothing", async () => {
    const user = await createTestUser(db, "service_writer");
    const { token } = await createToken(db, { kind: "reset", email: user.email, userId: user.id });
    const r = await run(() =>
      resetToken.action(
        args(
          postTo(`/reset/${token}`, {
            password: "fresh-password-12",
            confirm: "fresh-password-12",
          }),
          { token },
        ),
      ),
    );
    expect(r.status).toBe(400);
    const row = await db
      .selectFrom("users")
      .where("id", "=", user.id)
      .select("password_hash")
      .executeTakeFirstOrThrow();
    const { default: bcrypt } = await import("bcryptjs");
    expect(await bcrypt.compare(user.password, row.password_hash!)).toBe(true);
  });
});

describe("an expired reset link", () => {
  it("is refused on the page and on the post, with a clear message", async () => {
    const user = await createTestUser(db, "builder");
    const { token, row } = await createToken(db, {
      kind: "reset",
      email: user.email,
      userId: user.id,
    });
    await db
      .updateTable("auth_tokens")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("id", "=", row.id)
      .execute();
    const page = await resetToken.loader(args(signedOutRequest(`/reset/${token}`), { token }));
    expect(page.problem).toMatch(/expired/);
    const r = await run(() =>
      resetToken.action(
        args(
          postTo(
            `/reset/${token}`,
            asFromPage({ password: "fresh-password-34", confirm: "fresh-password-34" }),
          ),
          { token },
        ),
      ),
    );
    expect(r.status).toBe(410);
    expect(r.value.result.error[""]).toEqual([
      expect.stringMatching(/expired .*Ask for a new one/),
    ]);
  });
});
