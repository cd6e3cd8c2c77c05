import type { ColumnType, Generated, Selectable } from "kysely";
import type { Timestamp } from "./core";

type JsonCol<T> = ColumnType<T, T | string, T | string>;
type TsNull = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;

export const REQUEST_STATUSES = [
  "new",
  "contacted",
  "waiting_on_rider",
  "converted",
  "declined",
] as const;
export type RequestStatus = (typeof REQUEST_STATUSES)[number];

export const KEEP_MARKS = ["keep", "replace", "review"] as const;
export type KeepMark = (typeof KEEP_MARKS)[number];

export interface EngineFamilyTable {
  id: Generated<number>;
  name: string;
  year_from: number;
  year_to: number | null;
  /** numeric columns (db/connect.ts reads them back as numbers) */
  stock_bore_mm: number;
  stock_stroke_mm: number;
  displacement_cc: number;
  deck_height_mm: number | null;
  stock_rev_limit_rpm: number | null;
  /** slot key → catalog part id of the part the engine left the factory with */
  stock_parts: ColumnType<
    Record<string, number>,
    Record<string, number> | string | undefined,
    Record<string, number> | string
  >;
  notes: Generated<string>;
  version: Generated<number>;
  archived_at: TsNull;
  created_at: Timestamp;
  updated_at: Timestamp;
  updated_by: number | null;
}

export interface EngineFamilyVersionTable {
  id: Generated<number>;
  family_id: number;
  version: number;
  snapshot: JsonCol<unknown>;
  change: string;
  changed_by: number | null;
  changed_at: Timestamp;
}

export interface BuildRequestTable {
  id: Generated<number>;
  name: string;
  email: string;
  phone: string | null;
  bike_year: number;
  engine_family_id: number | null;
  bike_model: string;
  mileage: number | null;
  current_parts: ColumnType<string[], string[] | string | undefined, string[] | string>;
  goals: string;
  riding: ColumnType<string[], string[] | undefined, string[]>;
  budget: string;
  time_frame: string;
  contact_by: string;
  consent: boolean;
  status: ColumnType<RequestStatus, RequestStatus | undefined, RequestStatus>;
  customer_id: number | null;
  bike_id: number | null;
  package_id: number | null;
  client_address: Generated<string>;
  created_at: Timestamp;
  updated_at: Timestamp;
}

export interface BuildRequestStatusChangeTable {
  id: Generated<number>;
  request_id: number;
  from_status: RequestStatus | null;
  to_status: RequestStatus;
  changed_by: number | null;
  changed_at: Timestamp;
}

export interface BuildRequestNoteTable {
  id: Generated<number>;
  request_id: number;
  body: string;
  author_id: number | null;
  created_at: Timestamp;
}

export interface BikePartTable {
  id: Generated<number>;
  bike_id: number;
  part_id: number | null;
  category: string;
  description: string;
  /** a date; read it with to_char (pg would make it a Date at midnight, local time) */
  fitted_on: ColumnType<Date | null, string | null | undefined, string | null>;
  fitted_mileage: number | null;
  notes: Generated<string>;
  created_by: number | null;
  created_at: Timestamp;
  updated_at: Timestamp;
  removed_at: TsNull;
  removed_by: number | null;
}

export interface KeepCheckOverrideTable {
  id: Generated<number>;
  package_id: number;
  bike_part_id: number;
  mark: KeepMark;
  note: string;
  set_by: number | null;
  set_at: Timestamp;
}

export interface KeepCheckTable {
  package_id: number;
  marks: JsonCol<unknown>;
  checked_by: number | null;
  checked_at: Timestamp;
}

export interface RequestTables {
  engine_families: EngineFamilyTable;
  engine_family_versions: EngineFamilyVersionTable;
  build_requests: BuildRequestTable;
  build_request_status_changes: BuildRequestStatusChangeTable;
  build_request_notes: BuildRequestNoteTable;
  bike_parts: BikePartTable;
  keep_check_overrides: KeepCheckOverrideTable;
  keep_checks: KeepCheckTable;
}

export type EngineFamilyRow = Selectable<EngineFamilyTable>;
export type BuildRequestRow = Selectable<BuildRequestTable>;
export type BikePartRow = Selectable<BikePartTable>;
