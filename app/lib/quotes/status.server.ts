// Status moves made by the work itself (sending a quote, a paid deposit), recorded like
// the manual ones: who (or which event) and when.
import { sql } from "kysely";
import type { PackageStatus } from "../../../db/schema/packages";
import type { Db } from "../db.server";

export async function moveStatus(
  trx: Db,
  packageId: number,
  from: PackageStatus,
  to: PackageStatus,
  userId: number | null,
  reason: string,
): Promise<boolean> {
  const moved = await trx
    .updateTable("packages")
    .set({ status: to, updated_at: sql`now()` })
    .where("id", "=", packageId)
    .where("status", "=", from)
    .executeTakeFirst();
  if (Number(moved.numUpdatedRows) !== 1) return false;
  await trx
    .insertInto("package_status_changes")
    .values({ package_id: packageId, from_status: from, to_status: to, changed_by: userId, reason })
    .execute();
  return true;
}
