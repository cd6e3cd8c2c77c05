import { describe, expect, it } from "vitest";
import { getUser } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { changeRole, LAST_OWNER, setDisabled } from "~/lib/auth/staff.server";
import { action, loader } from "~/routes/staff";
import { cookieFor, createTestUser, form, requestAs, signedOutRequest } from "../support/auth";

const args = (request: Request) => ({ request, params: {}, context: {} }) as never;
type Reply = { init: { status: number }; data: { result: { error: Record<string, string[]> } } };

async function ownerPost(fields: Record<string, string>) {
  const owner = await createTestUser(getDb(), "owner");
  return action(args(await requestAs(owner, "/staff", { method: "POST", body: form(fields) })));
}

describe("/staff", () => {
  it("lists the accounts and pending invites for the owner", async () => {
    const owner = await createTestUser(getDb(), "owner");
    const other = await createTestUser(getDb(), "apprentice");
    const data = await loader(args(await requestAs(owner, "/staff")));
    const row = data.staff.find((s) => s.id === other.id)!;
    expect(row).toMatchObject({ email: other.email, role: "apprentice", hasPassword: true });
    expect(row).not.toHaveProperty("password_hash");
  });

  it("changes a role; the open session has the new role on its next request", async () => {
    const worker = await createTestUser(getDb(), "apprentice");
    const cookie = await cookieFor(worker);
    const res = await ownerPost({ intent: "role", userId: String(worker.id), role: "builder" });
    expect((res as { done: string }).done).toBe("Role changed to builder.");
    expect((await getUser(signedOutRequest("/", { headers: { Cookie: cookie } })))?.role).toBe(
      "builder",
    );
  });

  it("disabling an account ends its open sessions at once; enabling lets it sign in again", async () => {
    const worker = await createTestUser(getDb(), "service_writer");
    const cookie = await cookieFor(worker);
    const req = () => signedOutRequest("/", { headers: { Cookie: cookie } });
    expect(await getUser(req())).not.toBeNull();
    await ownerPost({ intent: "disable", userId: String(worker.id) });
    expect(await getUser(req())).toBeNull();
    const sessions = await getDb()
      .selectFrom("sessions")
      .where("user_id", "=", worker.id)
      .selectAll()
      .execute();
    expect(sessions).toHaveLength(0);
    await ownerPost({ intent: "enable", userId: String(worker.id) });
    const row = await getDb()
      .selectFrom("users")
      .where("id", "=", worker.id)
      .select("disabled_at")
      .executeTakeFirstOrThrow();
    expect(row.disabled_at).toBeNull();
  });

  it("refuses to invite an address that already has an account, beside the field", async () => {
    const existing = await createTestUser(getDb(), "builder");
    const res = (await ownerPost({
      intent: "invite",
      email: existing.email.toUpperCase(),
      role: "builder",
    })) as Reply;
    expect(res.init.status).toBe(400);
    expect(res.data.result.error.email).toEqual(["An account with this e-mail already exists."]);
  });

  it("a builder cannot post to it", async () => {
    const builder = await createTestUser(getDb(), "builder");
    const victim = await createTestUser(getDb(), "apprentice");
    const req = await requestAs(builder, "/staff", {
      method: "POST",
      body: form({ intent: "disable", userId: String(victim.id) }),
    });
    await expect(action(args(req))).rejects.toMatchObject({ init: { status: 403 } });
  });
});

describe("the last active owner", () => {
  // Other test files create owners in the same database; inside a rolled-back
  // transaction this owner is made the only active one.
  async function asOnlyOwner(
    check: (trx: Parameters<typeof changeRole>[0], ownerId: number) => Promise<void>,
  ) {
    const owner = await createTestUser(getDb(), "owner");
    const rollback = new Error("rollback");
    await expect(
      getDb()
        .transaction()
        .execute(async (trx) => {
          await trx
            .updateTable("users")
            .set({ disabled_at: new Date() })
            .where("role", "=", "owner")
            .where("id", "!=", owner.id)
            .execute();
          await check(trx, owner.id);
          throw rollback;
        }),
    ).rejects.toBe(rollback);
  }

  it("cannot be demoted", async () => {
    await asOnlyOwner(async (trx, id) => {
      await expect(changeRole(trx, id, "builder")).rejects.toThrow(LAST_OWNER);
    });
  });

  it("cannot be disabled", async () => {
    await asOnlyOwner(async (trx, id) => {
      await expect(setDisabled(trx, id, true)).rejects.toThrow(LAST_OWNER);
    });
  });

  it("can be changed once another owner is active", async () => {
    await asOnlyOwner(async (trx, id) => {
      const second = await trx
        .insertInto("users")
        .values({ email: `second-${id}@crew.test`, name: "Second Owner", role: "owner" })
        .returning("id")
        .executeTakeFirstOrThrow();
      await changeRole(trx, id, "builder");
      await expect(setDisabled(trx, second.id, true)).rejects.toThrow(LAST_OWNER);
    });
  });
});
