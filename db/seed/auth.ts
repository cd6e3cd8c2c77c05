import bcrypt from "bcryptjs";
import type { Kysely } from "kysely";
import type { Database } from "../schema";
import { DEMO_STAFF } from "./core";

// Every demo account signs in with this password. It is for the demo data only.
export const DEMO_PASSWORD = "bench-and-bore-0142";

export async function seedAuth(db: Kysely<Database>) {
  const hash = await bcrypt.hash(DEMO_PASSWORD, 10);
  await db
    .updateTable("users")
    .set({ password_hash: hash })
    .where(
      "email",
      "in",
      DEMO_STAFF.map((s) => s.email),
    )
    .execute();
}
