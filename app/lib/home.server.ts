// What each role's home shows: counts from what the shop keeps, each linking to its list.
import type { SessionUser } from "./auth/auth.server";
import type { Db } from "./db.server";
import { can } from "./auth/permissions";
import { requestCounts } from "./requests/intake.server";
import { STATUS_LABELS } from "./requests/options";

export type HomeStat = { label: string; value: number; to?: string; note?: string };

const count = (n: { n: number | string } | undefined) => Number(n?.n ?? 0);

export async function homeStats(
  db: Db,
  user: SessionUser,
  now = new Date(),
): Promise<{ stats: HomeStat[]; statuses: { status: string; n: number }[] }> {
  const stats: HomeStat[] = [];
  let statuses: { status: string; n: number }[] = [];

  if (can(user.role, "packages:read")) {
    const rows = await db
      .selectFrom("packages")
      .where("is_template", "=", false)
      .groupBy("status")
      .select((eb) => ["status", eb.fn.countAll<number>().as("n")])
      .execute();
    statuses = rows.map((r) => ({ status: r.status, n: Number(r.n) }));
  }
  if (user.role === "builder" || user.role === "owner") {
    const mine = await db
      .selectFrom("packages")
      .where("is_template", "=", false)
      .where("builder_id", "=", user.id)
      .where("status", "in", ["draft", "quoted", "approved", "in_build", "on_dyno"])
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirst();
    stats.push({
      label: "My open packages",
      value: count(mine),
      to: `/packages?builder=${user.id}`,
    });
  }
  if (can(user.role, "requests:read")) {
    const counts = await requestCounts(db);
    stats.push({
      label: "New build requests",
      value: counts.new ?? 0,
      to: "/requests?status=new",
    });
    // the owner sees the whole queue by status
    if (user.role === "owner")
      for (const s of ["contacted", "waiting_on_rider", "converted", "declined"] as const)
        stats.push({
          label: `Requests: ${STATUS_LABELS[s].toLowerCase()}`,
          value: counts[s] ?? 0,
          to: `/requests?status=${s}`,
        });
  }
  if (can(user.role, "customers:read")) {
    const [customers, bikes] = await Promise.all([
      db
        .selectFrom("customers")
        .select((eb) => eb.fn.countAll<number>().as("n"))
        .executeTakeFirst(),
      db
        .selectFrom("bikes")
        .select((eb) => eb.fn.countAll<number>().as("n"))
        .executeTakeFirst(),
    ]);
    stats.push(
      { label: "Customers on file", value: count(customers) },
      { label: "Bikes on file", value: count(bikes) },
    );
  }
  if (can(user.role, "parts:read")) {
    const parts = await db
      .selectFrom("parts")
      .where("archived_at", "is", null)
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirst();
    stats.push({ label: "Parts on the shelf", value: count(parts), to: "/parts" });
  }
  if (can(user.role, "rules:read")) {
    const rules = await db
      .selectFrom("fit_rules")
      .where("active", "=", true)
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .executeTakeFirst();
    stats.push({ label: "Active fit rules", value: count(rules), to: "/rules" });
  }
  if (can(user.role, "staff:manage")) {
    const [staff, invites] = await Promise.all([
      db
        .selectFrom("users")
        .where("disabled_at", "is", null)
        .select((eb) => eb.fn.countAll<number>().as("n"))
        .executeTakeFirst(),
      db
        .selectFrom("auth_tokens")
        .where("kind", "=", "invite")
        .where("used_at", "is", null)
        .where("revoked_at", "is", null)
        .where("expires_at", ">", now)
        .select((eb) => eb.fn.countAll<number>().as("n"))
        .executeTakeFirst(),
    ]);
    stats.push({
      label: "Active staff",
      value: count(staff),
      to: "/staff",
      note: count(invites) ? `${count(invites)} invite(s) pending` : undefined,
    });
  }
  return { stats, statuses };
}
