// Reading a package's measured figure from its counting runs (one query), for the bench's
// evaluation and the dyno page.
import { sql } from "kysely";
import type { Db } from "../db.server";
import { measuredFrom, type CountingRunPeaks, type MeasuredFigure } from "./measured";

export async function readMeasured(db: Db, packageId: number): Promise<MeasuredFigure | null> {
  const rows = await sql<CountingRunPeaks>`
    select r.id as "runId",
      pp.power_kw_corrected as "powerKw", pp.rpm as "powerRpm",
      tp.torque_nm_corrected as "torqueNm", tp.rpm as "torqueRpm"
      from dyno_runs r
      cross join lateral (select power_kw_corrected, rpm from dyno_points
                           where run_id = r.id order by power_kw_corrected desc, seq limit 1) pp
      cross join lateral (select torque_nm_corrected, rpm from dyno_points
                           where run_id = r.id order by torque_nm_corrected desc, seq limit 1) tp
     where r.package_id = ${packageId} and r.counts and r.correction_factor is not null
     order by r.id`
    .execute(db)
    .then((r) => r.rows);
  return measuredFrom(rows);
}
