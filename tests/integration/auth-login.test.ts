import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import {
  clientAddress,
  MAX_ADDRESS_FAILURES,
  recordAttempt,
  secondsUntilAllowed,
  THROTTLE_WINDOW_SECONDS,
} from "~/lib/auth/throttle.server";
import { action, loader } from "~/routes/login";
import { action as logout } from "~/routes/logout";
import { cookieFor, createTestUser, form, requestAs, signedOutRequest } from "../support/auth";
import { asFromPage } from "../support/honeypot";

type Reply = {
  init: { status: number; headers?: Record<string, string> };
  data: { result: { error: Record<string, string[]>; initialValue: Record<string, string> } };
};
const args = (request: Request) => ({ request, params: {}, context: {} }) as never;
const post = (fields: Record<string, string>, headers?: HeadersInit) =>
  action(
    args(signedOutRequest("/login", { method: "POST", body: form(asFromPage(fields)), headers })),
  );

describe("sign-in", () => {
  it("signs in with the right password: a session cookie and a redirect to where the user was going", async () => {
    const user = await createTestUser(getDb(), "builder");
    const res = (await post({
      email: user.email.toUpperCase(),
      password: user.password,
      redirectTo: "/staff?x=1",
    })) as Response;
    expect(res.status).toBe(302);
    expect(res.headers.get("Location")).toBe("/staff?x=1");
    const setCookie = res.headers.get("Set-Cookie")!;
    expect(setCookie).toMatch(
      /^tw_session=[^;]+; Max-Age=1209600; Path=\/; HttpOnly; SameSite=Lax/,
    );
    expect(setCookie).not.toMatch(/Secure/); // APP_URL is plain http in tests
  });

  it("ignores a redirect to another site", async () => {
    const user = await createTestUser(getDb(), "apprentice");
    const res = (await post({
      email: user.email,
      password: user.password,
      redirectTo: "//evil.test/steal",
    })) as Response;
    expect(res.headers.get("Location")).toBe("/");
  });

  it("a wrong password shows one error, keeps the e-mail and drops the password", async () => {
    const user = await createTestUser(getDb(), "service_writer");
    const res = (await post({ email: user.email, password: "not-it" })) as Reply;
    expect(res.init.status).toBe(401);
    expect(res.data.result.error[""]).toEqual([
      "That e-mail and password do not match an active account.",
    ]);
    expect(res.data.result.initialValue.email).toBe(user.email);
    expect(res.data.result.initialValue.password).toBeUndefined();
  });

  it("says the same for an unknown e-mail and for a disabled account", async () => {
    const unknown = (await post({
      email: `nobody-${randomBytes(3).toString("hex")}@crew.test`,
      password: "whatever1",
    })) as Reply;
    const disabledUser = await createTestUser(getDb(), "builder", { disabled_at: new Date() });
    const disabled = (await post({
      email: disabledUser.email,
      password: disabledUser.password,
    })) as Reply;
    expect(unknown.data.result.error[""]).toEqual([
      "That e-mail and password do not match an active account.",
    ]);
    expect(disabled.data.result.error[""]).toEqual(unknown.data.result.error[""]);
    expect(disabled.init.status).toBe(unknown.init.status);
  });

  it("shows field errors for an empty form", async () => {
    const res = (await post({ email: "", password: "" })) as Reply;
    expect(res.init.status).toBe(400);
    expect(res.data.result.error.email).toEqual([
      "Enter the e-mail address of your staff account.",
    ]);
    expect(res.data.result.error.password).toEqual(["Enter your password."]);
  });

  it("refuses a sign-in posted from another site", async () => {
    const user = await createTestUser(getDb(), "owner");
    await expect(
      post({ email: user.email, password: user.password }, { Origin: "http://evil.test" }),
    ).rejects.toMatchObject({
      init: { status: 403 },
    });
  });

  it("sends a signed-in visitor of /login on to the app", async () => {
    const user = await createTestUser(getDb(), "owner");
    await expect(loader(args(await requestAs(user, "/login?redirectTo=/staff")))).rejects.toSatisfy(
      (r: Response) => r.status === 302 && r.headers.get("Location") === "/staff",
    );
  });

  it("signing out ends the session", async () => {
    const user = await createTestUser(getDb(), "owner");
    const cookie = await cookieFor(user);
    const res = (await logout(
      args(signedOutRequest("/logout", { method: "POST", headers: { Cookie: cookie } })),
    )) as Response;
    expect(res.headers.get("Location")).toBe("/login");
    const { getUser } = await import("~/lib/auth/auth.server");
    expect(await getUser(signedOutRequest("/", { headers: { Cookie: cookie } }))).toBeNull();
  });
});

describe("throttling", () => {
  it("after five failures for one account from one address, even the right password waits, with a clear message", async () => {
    const user = await createTestUser(getDb(), "builder");
    for (let i = 0; i < 5; i++)
      expect(
        ((await post({ email: user.email, password: `wrong-${i}` })) as Reply).init.status,
      ).toBe(401);
    const blocked = (await post({ email: user.email, password: user.password })) as Reply;
    expect(blocked.init.status).toBe(429);
    expect(blocked.data.result.error[""]).toEqual([
      "Too many failed sign-ins. Wait 1 minute before trying again.",
    ]);
    expect(Number(blocked.init.headers?.["Retry-After"])).toBeGreaterThan(50);
    expect(Number(blocked.init.headers?.["Retry-After"])).toBeLessThanOrEqual(60);

    // once the failures are older than the window, the right password works again
    await getDb()
      .updateTable("login_attempts")
      .set({ created_at: new Date(Date.now() - (THROTTLE_WINDOW_SECONDS + 5) * 1000) })
      .where("email", "=", user.email.toLowerCase())
      .execute();
    expect(((await post({ email: user.email, password: user.password })) as Response).status).toBe(
      302,
    );
  });

  it("the same message for an e-mail that has no account", async () => {
    const email = `ghost-${randomBytes(3).toString("hex")}@crew.test`;
    for (let i = 0; i < 5; i++) await post({ email, password: `wrong-${i}` });
    const blocked = (await post({ email, password: "again-wrong" })) as Reply;
    expect(blocked.init.status).toBe(429);
    expect(blocked.data.result.error[""]![0]).toMatch(
      /^Too many failed sign-ins\. Wait \d+ minutes?/,
    );
  });

  it("many failures from one address hold that address back, whichever accounts they try", async () => {
    const ip = `203.0.113.${Math.floor(Math.random() * 250)}-${randomBytes(2).toString("hex")}`;
    for (let i = 0; i < MAX_ADDRESS_FAILURES; i++)
      await recordAttempt(getDb(), `spray-${i}-${ip}@crew.test`, ip, false);
    expect(await secondsUntilAllowed(getDb(), `fresh-${ip}@crew.test`, ip)).toBeGreaterThan(
      14 * 60,
    );
    expect(await secondsUntilAllowed(getDb(), `fresh-${ip}@crew.test`, `${ip}-other`)).toBe(0);
  });

  it("believes X-Forwarded-For only behind our own proxy", () => {
    const req = new Request("http://t/login", {
      headers: { "X-Forwarded-For": "198.51.100.7, 10.0.0.1" },
    });
    expect(clientAddress(req, true)).toBe("198.51.100.7");
    expect(clientAddress(req, false)).toBe("127.0.0.1");
  });
});
