import type { ColumnType, Generated } from "kysely";
import type { Timestamp } from "./core";

export type StoredFileKind = "dyno_run" | "photo" | "photo_thumb";
export type TorqueUnit = "lbft" | "nm";
export type PowerUnit = "hp" | "kw";

/** One object in storage: its key, what it is, and the SHA-256 of its bytes. */
export interface StoredFileTable {
  id: Generated<number>;
  package_id: number;
  object_key: string;
  kind: StoredFileKind;
  content_type: string;
  byte_size: number;
  sha256: string;
  original_name: string;
  uploaded_by: number | null;
  created_at: Timestamp;
}

export interface DynoRunTable {
  id: Generated<number>;
  package_id: number;
  file_id: number;
  label: string;
  run_date: ColumnType<string | null, string | null | undefined, string | null>;
  gear: Generated<string>;
  notes: Generated<string>;
  torque_unit: TorqueUnit;
  power_unit: PowerUnit;
  air_temp_c: number | null;
  baro_kpa: number | null;
  humidity_pct: number | null;
  /** null: the weather is missing and the run is shown uncorrected */
  correction_factor: number | null;
  correction_standard: string | null;
  point_count: number;
  dropped_rows: Generated<number>;
  /** marked by the builder: its corrected peaks count for the package's measured figure */
  counts: Generated<boolean>;
  created_by: number | null;
  created_at: Timestamp;
}

/** One point of a run in SI units, observed and corrected. */
export interface DynoPointTable {
  run_id: number;
  seq: number;
  /** the line of the uploaded file it came from */
  line: number;
  rpm: number;
  torque_nm: number;
  power_kw: number;
  torque_nm_corrected: number | null;
  power_kw_corrected: number | null;
}

export interface PackagePhotoTable {
  id: Generated<number>;
  package_id: number;
  file_id: number;
  thumb_file_id: number;
  width: number;
  height: number;
  caption: Generated<string>;
  on_sheet: Generated<boolean>;
  created_by: number | null;
  created_at: Timestamp;
}

export interface DynoTables {
  stored_files: StoredFileTable;
  dyno_runs: DynoRunTable;
  dyno_points: DynoPointTable;
  package_photos: PackagePhotoTable;
}
