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
  /** The number of the package's latest revision (open or closed). */
  current_revision: Generated<number>;
  /** The working copy's version: every edit adds one; a bench save must name it (stale-save token). */
  version: Generated<number>;
  /** The working copy's spec (BenchSpec in app/lib/bench/spec.ts). */
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
  /** When the package was published to the library (null: not published; templates always are). */
  published_at: Timestamp | null;
  published_by: number | null;
  /** The publisher's note to the reader of the library. */
  publish_note: Generated<string>;
}

export const CLOSE_REASONS = [
  "saved",
  "started",
  "note",
  "other_editor",
  "status",
  "quiet",
] as const;
/**
 * Why a revision closed: `saved` one save of the time before named revisions (migrated as it
 * was), `started` the package's first state, `note` the builder closed it with a note,
 * `other_editor` someone else started editing, `status` the package changed status,
 * `quiet` the shop's quiet period passed after its last edit.
 */
export type CloseReason = (typeof CLOSE_REASONS)[number];

/**
 * A named checkpoint holding the edits since the previous one. While open (closed_at null)
 * its content is the working copy; when it closes, the working copy's content is copied here.
 */
export interface PackageRevisionTable {
  id: Generated<number>;
  package_id: number;
  revision: number;
  spec: JsonCol<unknown> | null;
  results: JsonCol<unknown> | null;
  rule_snapshot: JsonCol<unknown> | null;
  findings: JsonCol<unknown> | null;
  /** Its first edit's line, or for a save of the time before named revisions what it changed. */
  change: string;
  /** The builder's note, when closed with one ("106.4 bore, thinner gasket for 10.5:1"). */
  note: string | null;
  /** Whose edits it holds. */
  saved_by: number | null;
  /** When it last changed (opened, then closed). */
  saved_at: Timestamp;
  opened_at: Timestamp;
  closed_at: Timestamp | null;
  closed_by: number | null;
  close_reason: CloseReason | null;
}

/** The append-only edit log: one row per bench edit (or restore), never changed. */
export interface PackageEditTable {
  id: Generated<number>;
  package_id: number;
  /** The working copy's version this edit made. */
  version: number;
  /** The revision holding it. */
  revision: number;
  user_id: number | null;
  at: Timestamp;
  /** One line saying what it changed ("Cylinder: TW-CYL-1048 Big-bore cylinder pair"). */
  change: string;
  /** The bench action as parsed (BenchIntent); null for saves older than the log. */
  intent: JsonCol<unknown> | null;
  /** The spec after the edit. */
  spec: JsonCol<unknown>;
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
  package_edits: PackageEditTable;
  package_status_changes: PackageStatusChangeTable;
  user_preferences: UserPreferenceTable;
}

export type PackageRow = Selectable<PackageTable>;
export type PackageRevisionRow = Selectable<PackageRevisionTable>;
export type PackageEditRow = Selectable<PackageEditTable>;
