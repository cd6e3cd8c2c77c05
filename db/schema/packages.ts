import type { ColumnType, Generated, Selectable } from "kysely";
import type { Timestamp } from "./core";

export const PACKAGE_STATUSES = [
  "draft",
  "quoted",
  "approved",
  "in_build",
  "on_dyno",
  "delivered",
  "cancelled",
] as const;
export type PackageStatus = (typeof PACKAGE_STATUSES)[number];

export const POWER_BASES = ["target", "estimate", "measured"] as const;
export type PowerBasis = (typeof POWER_BASES)[number];

export type UnitSystem = "inch" | "metric";

// jsonb columns: written as a JSON string or value, read back as the value.
type JsonCol<T> = ColumnType<T, T | string, T | string>;

export interface PackageTable {
  id: Generated<number>;
  bike_id: number | null;
  is_template: Generated<boolean>;
  name: string;
  status: ColumnType<PackageStatus, PackageStatus | undefined, PackageStatus>;
  builder_id: number | null;
  rev_limit_rpm: number | null;
  power_hp: number | null;
  power_basis: PowerBasis | null;
  notes: Generated<string>;
  copied_from_id: number | null;
  /** The optimistic-concurrency token: the revision number a bench save must name. */
  current_revision: Generated<number>;
  /** Current revision's spec (BenchSpec in app/lib/bench/spec.ts). */
  spec: JsonCol<unknown>;
  /** Current revision's computed figures (calc's SpecResults, or null fields). */
  results: JsonCol<unknown>;
  /**
   * Current revision's fit-rule snapshot (PackageSnapshot from app/lib/fit-rules/snapshot.ts):
   * what the rules are evaluated against. Rule previews read this column.
   */
  rule_snapshot: JsonCol<unknown>;
  /** Current revision's findings (Finding[] from app/lib/fit-rules/rules.server.ts). */
  findings: JsonCol<unknown>;
  created_by: number | null;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface PackageRevisionTable {
  id: Generated<number>;
  package_id: number;
  revision: number;
  spec: JsonCol<unknown>;
  results: JsonCol<unknown>;
  rule_snapshot: JsonCol<unknown>;
  findings: JsonCol<unknown>;
  /** One line saying what this save changed ("Cylinder: 4.310 in big-bore kit"). */
  change: string;
  saved_by: number | null;
  saved_at: Timestamp;
}

export interface PackageStatusChangeTable {
  id: Generated<number>;
  package_id: number;
  from_status: PackageStatus | null;
  to_status: PackageStatus;
  changed_by: number | null;
  changed_at: Timestamp;
  /** why, when it is not the usual next step (a cancel) or the work moved it ("Quote sent") */
  reason: Generated<string>;
}

export interface UserPreferenceTable {
  user_id: number;
  units: ColumnType<UnitSystem, UnitSystem | undefined, UnitSystem>;
  updated_at: Timestamp;
}

export interface PackageTables {
  packages: PackageTable;
  package_revisions: PackageRevisionTable;
  package_status_changes: PackageStatusChangeTable;
  user_preferences: UserPreferenceTable;
}

export type PackageRow = Selectable<PackageTable>;
export type PackageRevisionRow = Selectable<PackageRevisionTable>;
