import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { getDb } from "~/lib/db.server";
import bcrypt from "bcryptjs";
import { env } from "~/lib/env.server";
import {
  clientAddress,
  CLIENT_ADDRESS_HEADER,
  MAX_ADDRESS_FAILURES,
  recordAttempt,
  secondsUntilAllowed,
  THROTTLE_WINDOW_SECONDS,
} from "~/lib/auth/throttle.server";
import { action, loader } from "~/routes/login";
import { action as logout } from "~/routes/logout";
import {
  cookieFor,
  createTestUser,
  form,
  requestAs,
  signedOutRequest,
  TEST_PASSWORD,
  TEST_PASSWORD_HASH,
} from "../support/auth";
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

/** A sign-in post with exactly these headers (no Origin added). */
const bare = (fields: Record<string, string>, headers: Record<string, string>) =>
  action(
    args(
      new Request(new URL("/login", env().APP_URL), {
        method: "POST",
        body: form(asFromPage(fields)),
        headers,
      }),
    ),
  );

/** Whether a call threw the same-origin refusal (403). */
async function refusedAsCrossSite(p: Promise<unknown>): Promise<boolean> {
  try {
    await p;
    return false;
  } catch (e: any) {
    return e?.init?.status === 403;
  }
}

describe("sign-in", () => {
  it("the test users' precomputed hash is bcrypt of the test password at the app's cost", async () => {
    expect(await bcrypt.compare(TEST_PASSWORD, TEST_PASSWORD_HASH)).toBe(true);
    expect(bcrypt.getRounds(TEST_PASSWORD_HASH)).toBe(10);
  });

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

  it("without an Origin header, a Referer from our own pages is accepted and any other refused", async () => {
    const user = await createTestUser(getDb(), "builder");
    const ours = `${new URL(env().APP_URL).origin}/login?redirectTo=/staff`;
    const ok = (await bare(
      { email: user.email, password: user.password },
      { Referer: ours },
    )) as Response;
    expect(ok.status).toBe(302);
    expect(
      await refusedAsCrossSite(
        bare({ email: user.email, password: user.password }, { Referer: "http://evil.test/login" }),
      ),
    ).toBe(true);
    expect(
      await refusedAsCrossSite(
        bare({ email: user.email, password: user.password }, { Referer: "not a url" }),
      ),
    ).toBe(true);
    // neither header: refused
    expect(await refusedAsCrossSite(bare({ email: user.email, password: user.password }, {}))).toBe(
      true,
    );
    // Origin, when sent, decides, whatever the Referer says
    expect(
      await refusedAsCrossSite(
        bare(
          { email: user.email, password: user.password },
          { Origin: "http://evil.test", Referer: ours },
        ),
      ),
    ).toBe(true);
  });

  it("signing in over an existing session cookie gives a fresh session id", async () => {
    const user = await createTestUser(getDb(), "builder");
    const old = await cookieFor(user);
    const res = (await post(
      { email: user.email, password: user.password },
      { Cookie: old },
    )) as Response;
    expect(res.status).toBe(302);
    const fresh = res.headers.get("Set-Cookie")!.split(";")[0]!;
    expect(fresh.startsWith("tw_session=")).toBe(true);
    expect(fresh).not.toBe(old);
    const { getUser } = await import("~/lib/auth/auth.server");
    const me = await getUser(signedOutRequest("/", { headers: { Cookie: fresh } }));
    expect(me?.id).toBe(user.id);
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
  it("after five failures for one account, even the right password waits, with a clear message", async () => {
    const user = await createTestUser(getDb(), "builder");
    for (let i = 0; i < 5; i++)
      expect(
        ((await post({ email: user.email, password: `wrong-${i}` })) as Reply).init.status,
      ).toBe(401);
    const blocked = (await post({ email: user.email, password: user.password })) as Reply;
    expect(blocked.init.status).toBe(429);
    expect(blocked.data.result.error[""]).toEqual([
      "Too many failed sign-ins. Wait 15 minutes before trying again.",
    ]);
    expect(Number(blocked.init.headers?.["Retry-After"])).toBeGreaterThan(14 * 60);

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

  it("a successful sign-in clears the earlier failures of that account", async () => {
    const user = await createTestUser(getDb(), "service_writer");
    for (let i = 0; i < 4; i++)
      expect(
        ((await post({ email: user.email, password: `wrong-${i}` })) as Reply).init.status,
      ).toBe(401);
    expect(((await post({ email: user.email, password: user.password })) as Response).status).toBe(
      302,
    );
    // four more failures: eight in the window, but only four since the success
    for (let i = 0; i < 4; i++)
      expect(
        ((await post({ email: user.email, password: `again-${i}` })) as Reply).init.status,
      ).toBe(401);
    expect(((await post({ email: user.email, password: user.password })) as Response).status).toBe(
      302,
    );
    // counting starts again from that success: five failures hold the account back
    for (let i = 0; i < 5; i++) await post({ email: user.email, password: `later-${i}` });
    expect(
      ((await post({ email: user.email, password: user.password })) as Reply).init.status,
    ).toBe(429);
  });

  it("the same message for an e-mail that has no account", async () => {
    const email = `ghost-${randomBytes(3).toString("hex")}@crew.test`;
    for (let i = 0; i < 5; i++) await post({ email, password: `wrong-${i}` });
    const blocked = (await post({ email, password: "again-wrong" })) as Reply;
    expect(blocked.init.status).toBe(429);
    expect(blocked.data.result.error[""]![0]).toMatch(
      /^Too many failed sign-ins\. Wait \d+ minutes/,
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

  const unique = () => `198.51.100.${randomBytes(3).toString("hex")}`;
  const stranger = () => `spray-${randomBytes(4).toString("hex")}@crew.test`;

  it("the per-address limit through the sign-in action: the socket address, X-Forwarded-For ignored", async () => {
    const socket = unique();
    // all but one failure recorded beforehand; the last one goes through the action
    for (let i = 0; i < MAX_ADDRESS_FAILURES - 1; i++)
      await recordAttempt(getDb(), stranger(), socket, false);
    const last = (await post(
      { email: stranger(), password: "wrong-pass" },
      { [CLIENT_ADDRESS_HEADER]: socket, "X-Forwarded-For": unique() },
    )) as Reply;
    expect(last.init.status).toBe(401);
    // a client-chosen X-Forwarded-For does not get a held-back address out
    const blocked = (await post(
      { email: stranger(), password: "wrong-pass" },
      { [CLIENT_ADDRESS_HEADER]: socket, "X-Forwarded-For": unique() },
    )) as Reply;
    expect(blocked.init.status).toBe(429);
    expect(blocked.data.result.error[""]![0]).toMatch(
      /^Too many failed sign-ins\. Wait 15 minutes/,
    );
    // another socket address is not held back
    const other = (await post(
      { email: stranger(), password: "wrong-pass" },
      { [CLIENT_ADDRESS_HEADER]: unique() },
    )) as Reply;
    expect(other.init.status).toBe(401);
  });

  it("the per-address limit through the sign-in action behind our proxy (TRUST_PROXY=1)", async () => {
    const e = env();
    const before = e.TRUST_PROXY;
    e.TRUST_PROXY = "1";
    try {
      const client = unique();
      const proxy = unique(); // every request arrives from the proxy's socket
      for (let i = 0; i < MAX_ADDRESS_FAILURES - 1; i++)
        await recordAttempt(getDb(), stranger(), client, false);
      const via = (xff: string) => ({ [CLIENT_ADDRESS_HEADER]: proxy, "X-Forwarded-For": xff });
      expect(
        (
          (await post(
            { email: stranger(), password: "wrong" },
            via(`${client}, 10.0.0.1`),
          )) as Reply
        ).init.status,
      ).toBe(401);
      expect(
        ((await post({ email: stranger(), password: "wrong" }, via(client))) as Reply).init.status,
      ).toBe(429);
      // another client behind the same proxy is not held back
      expect(
        ((await post({ email: stranger(), password: "wrong" }, via(unique()))) as Reply).init
          .status,
      ).toBe(401);
      // nothing was counted against the proxy's own address
      expect(await secondsUntilAllowed(getDb(), stranger(), proxy)).toBe(0);
    } finally {
      e.TRUST_PROXY = before;
    }
  });

  it("believes X-Forwarded-For only behind our own proxy", () => {
    const req = new Request("http://t/login", {
      headers: { "X-Forwarded-For": "198.51.100.7, 10.0.0.1" },
    });
    expect(clientAddress(req, true)).toBe("198.51.100.7");
    expect(clientAddress(req, false)).toBe("127.0.0.1");
  });
});
