// The keep-check of a package: every part the bike carries now, marked keep, replace or
// review with the reasons. Fit rules are the bench's own: each installed part is put in
// its slot of the package's spec and the spec is evaluated by the same pipeline the
// bench saves with (evaluateSpec); the findings that appear only with the part there,
// or that ask to upgrade its category, are about the part.
import { sql } from "kysely";
import type { Db } from "../db.server";
import type { KeepMark } from "../../../db/schema/requests";
import { normaliseSpec, type BenchSpec } from "../bench/spec";
import { loadActiveRules } from "../fit-rules/rules.server";
import type { PackageSnapshot } from "../fit-rules/snapshot";
import { SLOTS } from "../packages/slots";
import { evaluateSpec, loadParts } from "../packages/store.server";
import { listBikeParts } from "../customers/bikes.server";
import { decide, type Reason, type RuleHit } from "./marks";

export interface KeepCheckRow {
  bikePartId: number;
  label: string;
  categoryLabel: string;
  free: boolean;
  fittedOn: string | null;
  computed: KeepMark;
  reasons: Reason[];
  override: { mark: KeepMark; note: string; by: string | null; at: string } | null;
  mark: KeepMark;
}

const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);

export async function computeKeepCheck(db: Db, packageId: number) {
  const pkg = await db
    .selectFrom("packages as p")
    .innerJoin("bikes as b", "b.id", "p.bike_id")
    .innerJoin("customers as c", "c.id", "b.customer_id")
    .leftJoin("users as u", "u.id", "p.builder_id")
    .leftJoin("keep_checks as k", "k.package_id", "p.id")
    .leftJoin("users as ku", "ku.id", "k.checked_by")
    .select([
      "p.id",
      "p.name",
      "p.status",
      "p.spec",
      "p.rule_snapshot",
      "p.builder_id",
      "u.name as builder",
      "b.id as bike_id",
      "b.year",
      "b.model",
      "c.id as customer_id",
      "c.name as customer",
      "k.checked_at",
      "ku.name as checked_by",
    ])
    .where("p.id", "=", packageId)
    .executeTakeFirst();
  if (!pkg) return null;
  const spec = normaliseSpec(pkg.spec);
  const snapshot = pkg.rule_snapshot as PackageSnapshot | null;
  const powerHp = spec.powerHp;
  const torqueNm = num(snapshot?.numbers?.torque_nm);
  const installed = await listBikeParts(db, pkg.bike_id);
  const rules = await loadActiveRules(db);
  const ids = [
    ...installed.flatMap((p) => (p.partId ? [p.partId] : [])),
    ...Object.values(spec.slots).flatMap((s) => (s.partId ? [s.partId] : [])),
  ];
  const parts = await loadParts(db, ids, true);
  const overrides = await db
    .selectFrom("keep_check_overrides as o")
    .leftJoin("users as u", "u.id", "o.set_by")
    .select(["o.bike_part_id", "o.mark", "o.note", "o.set_at", "u.name"])
    .where("o.package_id", "=", packageId)
    .execute();
  const overrideOf = new Map(overrides.map((o) => [o.bike_part_id, o]));

  const rows: KeepCheckRow[] = [];
  for (const ip of installed) {
    const slot = SLOTS.find((s) => s.category === ip.category) ?? null;
    const inSlot = slot ? (spec.slots[slot.key]?.partId ?? null) : null;
    const hits: RuleHit[] = [];
    if (slot && ip.partId !== null && (inSlot === null || inSlot === ip.partId)) {
      const withPart = withSlot(spec, slot.key, ip.partId);
      const without = withSlot(spec, slot.key, null);
      const [a, b] = await Promise.all([
        evaluateSpec(db, withPart, true, rules, parts),
        evaluateSpec(db, without, true, rules, parts),
      ]);
      const before = new Set(b.findings.map((f) => f.ruleId));
      for (const f of a.findings) {
        if (f.error) continue;
        if (!before.has(f.ruleId) || (f.kind === "upgrade" && f.upgradeCategory === ip.category))
          hits.push({
            ruleId: f.ruleId,
            ruleVersion: f.ruleVersion,
            ruleName: f.ruleName,
            kind: f.kind,
            message: f.message,
          });
      }
    }
    const part = ip.partId ? parts.get(ip.partId) : undefined;
    const pkgPart = inSlot !== null ? parts.get(inSlot) : undefined;
    const { mark, reasons } = decide({
      partId: ip.partId,
      categoryLabel: ip.categoryLabel,
      slotLabel: slot?.label ?? null,
      packagePartId: inSlot,
      packagePartLabel: pkgPart ? `${pkgPart.partNumber} ${pkgPart.name}` : null,
      hits,
      ratedHp: num(part?.attributes.ratedHp),
      ratedTorqueNm: num(part?.attributes.ratedTorqueNm),
      powerHp,
      torqueNm,
    });
    const o = overrideOf.get(ip.id);
    rows.push({
      bikePartId: ip.id,
      label: ip.label,
      categoryLabel: ip.categoryLabel,
      free: ip.partId === null,
      fittedOn: ip.fittedOn,
      computed: mark,
      reasons,
      override: o
        ? {
            mark: o.mark,
            note: o.note,
            by: o.name,
            at: new Date(o.set_at as unknown as string).toISOString(),
          }
        : null,
      mark: o?.mark ?? mark,
    });
  }
  return {
    package: {
      id: pkg.id,
      name: pkg.name,
      status: pkg.status,
      builderId: pkg.builder_id,
      builder: pkg.builder,
      powerHp,
      torqueNm,
    },
    bike: { id: pkg.bike_id, label: `${pkg.year} ${pkg.model}` },
    customer: { id: pkg.customer_id, name: pkg.customer },
    checked: pkg.checked_at
      ? { at: new Date(pkg.checked_at as unknown as string).toISOString(), by: pkg.checked_by }
      : null,
    rows,
  };
}

export type KeepCheck = NonNullable<Awaited<ReturnType<typeof computeKeepCheck>>>;

function withSlot(spec: BenchSpec, key: string, partId: number | null): BenchSpec {
  return { ...spec, slots: { ...spec.slots, [key]: { partId, measured: {} } } };
}

export async function setOverride(
  db: Db,
  packageId: number,
  bikePartId: number,
  mark: KeepMark,
  note: string,
  userId: number,
) {
  await db
    .insertInto("keep_check_overrides")
    .values({ package_id: packageId, bike_part_id: bikePartId, mark, note, set_by: userId })
    .onConflict((oc) =>
      oc.columns(["package_id", "bike_part_id"]).doUpdateSet({
        mark,
        note,
        set_by: userId,
        set_at: sql`now()`,
      }),
    )
    .execute();
}

export async function clearOverride(db: Db, packageId: number, bikePartId: number) {
  await db
    .deleteFrom("keep_check_overrides")
    .where("package_id", "=", packageId)
    .where("bike_part_id", "=", bikePartId)
    .execute();
}

/** Records the marks as checked: the parts marked replace are the quote's parts list. */
export async function markChecked(db: Db, check: KeepCheck, userId: number) {
  const marks = JSON.stringify(
    check.rows.map((r) => ({
      bikePartId: r.bikePartId,
      label: r.label,
      mark: r.mark,
      reasons: r.reasons.map((x) => x.text),
      note: r.override?.note ?? null,
    })),
  );
  await db
    .insertInto("keep_checks")
    .values({ package_id: check.package.id, marks, checked_by: userId })
    .onConflict((oc) =>
      oc.column("package_id").doUpdateSet({ marks, checked_by: userId, checked_at: sql`now()` }),
    )
    .execute();
}

/** Packages for a bike that carries parts, still draft or quoted, with no keep-check done. */
export async function waitingOnKeepCheck(db: Db, limit = 8) {
  return db
    .selectFrom("packages as p")
    .innerJoin("bikes as b", "b.id", "p.bike_id")
    .innerJoin("customers as c", "c.id", "b.customer_id")
    .leftJoin("keep_checks as k", "k.package_id", "p.id")
    .select(["p.id", "p.name", "b.year", "b.model", "c.name as customer"])
    .where("p.is_template", "=", false)
    .where("p.status", "in", ["draft", "quoted"])
    .where("k.package_id", "is", null)
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom("bike_parts as bp")
          .select("bp.id")
          .whereRef("bp.bike_id", "=", "b.id")
          .where("bp.removed_at", "is", null),
      ),
    )
    .orderBy("p.updated_at", "desc")
    .limit(limit)
    .execute();
}
