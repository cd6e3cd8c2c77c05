import { describe, expect, it, vi } from "vitest";
import { getUser, requireRole, requireUser, safeRedirect } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import {
  deleteExpiredSessions,
  destroySession,
  destroyUserSessions,
} from "~/lib/auth/session.server";
import { cookieFor, createTestUser, requestAs, signedOutRequest } from "../support/auth";

async function thrown(p: Promise<unknown>): Promise<any> {
  try {
    await p;
  } catch (e) {
    return e as Response;
  }
  throw new Error("expected a throw");
}

describe("sessions", () => {
  it("a signed cookie for a real session row identifies the user", async () => {
    const db = getDb();
    const user = await createTestUser(db, "builder");
    const me = await getUser(await requestAs(user, "/"));
    expect(me).toEqual({ id: user.id, email: user.email, name: user.name, role: "builder" });
  });

  it("a tampered cookie is no session", async () => {
    const user = await createTestUser(getDb(), "owner");
    const cookie = await cookieFor(user);
    const [name, value] = cookie.split("=") as [string, string];
    const forged = `${name}=${value.slice(0, 5)}${value[5] === "A" ? "B" : "A"}${value.slice(6)}`;
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: forged } }))).toBeNull();
    // an unsigned id straight from the table is refused too
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: `${name}=abc` } }))).toBeNull();
  });

  it("disabling an account or changing its role takes effect on the next request", async () => {
    const db = getDb();
    const user = await createTestUser(db, "service_writer");
    const cookie = await cookieFor(user);
    const req = () => signedOutRequest("/", { headers: { Cookie: cookie } });
    expect((await getUser(req()))?.role).toBe("service_writer");
    await db.updateTable("users").set({ role: "apprentice" }).where("id", "=", user.id).execute();
    expect((await getUser(req()))?.role).toBe("apprentice");
    await db
      .updateTable("users")
      .set({ disabled_at: new Date() })
      .where("id", "=", user.id)
      .execute();
    expect(await getUser(req())).toBeNull();
  });

  it("signing out deletes the row, so the old cookie no longer works", async () => {
    const user = await createTestUser(getDb(), "apprentice");
    const cookie = await cookieFor(user);
    const setCookie = await destroySession(
      getDb(),
      signedOutRequest("/", { headers: { Cookie: cookie } }),
    );
    expect(setCookie).toMatch(/Max-Age=0|Expires=Thu, 01 Jan 1970/);
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: cookie } }))).toBeNull();
  });

  it("expired sessions are refused and cleaned", async () => {
    const db = getDb();
    const user = await createTestUser(db, "builder");
    const cookie = await cookieFor(user);
    await db
      .updateTable("sessions")
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where("user_id", "=", user.id)
      .execute();
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: cookie } }))).toBeNull();
    expect(await deleteExpiredSessions(db)).toBeGreaterThanOrEqual(1);
    const left = await db
      .selectFrom("sessions")
      .where("user_id", "=", user.id)
      .selectAll()
      .execute();
    expect(left).toHaveLength(0);
  });

  it("destroyUserSessions ends every session of one user", async () => {
    const user = await createTestUser(getDb(), "owner");
    await cookieFor(user);
    await cookieFor(user);
    expect(await destroyUserSessions(getDb(), user.id)).toBe(2);
  });
});

describe("requireUser / requireRole", () => {
  it("redirects a signed-out visitor to sign-in and back", async () => {
    const res = (await thrown(requireUser(signedOutRequest("/packages/7?tab=bench")))) as Response;
    expect(res.status).toBe(302);
    expect(res.headers.get("Location")).toBe("/login?redirectTo=%2Fpackages%2F7%3Ftab%3Dbench");
  });

  it("answers 403 for a role not listed; owner is not implied", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const res = (await thrown(requireRole(await requestAs(owner, "/x"), "builder"))) as {
      init: { status: number };
    };
    expect(res.init.status).toBe(403);
    const ok = await requireRole(await requestAs(owner, "/x"), "owner", "builder");
    expect(ok.id).toBe(owner.id);
  });

  it("refuses a post from another origin even with a valid session", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const req = await requestAs(owner, "/staff", {
      method: "POST",
      headers: { Origin: "http://evil.test" },
      body: "a=1",
    });
    const res = (await thrown(requireUser(req))) as { init: { status: number }; data: string };
    expect(res.init.status).toBe(403);
    expect(res.data).toMatch(/another site/);
    const noOrigin = new Request("http://127.0.0.1:3000/staff", {
      method: "POST",
      headers: { Cookie: await cookieFor(owner) },
    });
    expect(
      ((await thrown(requireUser(noOrigin))) as { init: { status: number } }).init.status,
    ).toBe(403);
  });
});

describe("safeRedirect", () => {
  it.each([
    ["/packages/3", "/packages/3"],
    ["//evil.test/x", "/"],
    ["https://evil.test", "/"],
    ["/\\evil.test", "/"],
    ["", "/"],
    [null, "/"],
  ])("%s -> %s", (input, out) => {
    expect(safeRedirect(input)).toBe(out);
  });
});

describe("the session cookie under https", () => {
  it("is Secure when the app's address is https, and not otherwise", async () => {
    const plain = await import("~/lib/auth/session.server");
    expect(await plain.sessionCookie().serialize("x")).not.toMatch(/Secure/);
    vi.stubEnv("APP_URL", "https://shop.tallgrass.test");
    vi.resetModules();
    try {
      const tls = await import("~/lib/auth/session.server");
      const header = await tls.sessionCookie().serialize("x");
      expect(header).toMatch(/; Secure(;|$)/);
      expect(header).toMatch(/; HttpOnly/);
      expect(header).toMatch(/; SameSite=Lax/);
    } finally {
      vi.unstubAllEnvs();
      vi.resetModules();
    }
  });
});
