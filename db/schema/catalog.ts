import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely";
import type { Timestamp } from "./core";

export type Json = ColumnType<JsonValue, JsonValue | string, JsonValue | string>;
export type JsonValue = string | number | boolean | null | JsonValue[] | { [k: string]: JsonValue };
export type PartAttributes = Record<string, string | number | boolean | null>;

export const RULE_KINDS = ["conflict", "upgrade", "caution"] as const;
export type RuleKind = (typeof RULE_KINDS)[number];

export interface PartCategoryTable {
  slug: string;
  label: string;
  sort: Generated<number>;
  built_in: Generated<boolean>;
}

export interface PartTable {
  id: Generated<number>;
  part_number: string;
  category: string;
  maker: string;
  name: string;
  price_cents: number;
  labour_hours: ColumnType<number, number | undefined, number>;
  tags: ColumnType<string[], string[] | undefined, string[]>;
  stock: Generated<boolean>;
  attributes: ColumnType<
    PartAttributes,
    PartAttributes | string | undefined,
    PartAttributes | string
  >;
  notes: Generated<string>;
  version: Generated<number>;
  archived_at: Timestamp | null;
  created_at: Generated<Timestamp>;
  updated_at: Generated<Timestamp>;
  updated_by: number | null;
}

export interface PartVersionTable {
  id: Generated<number>;
  part_id: number;
  version: number;
  snapshot: Json;
  change: string;
  changed_by: number | null;
  changed_at: Generated<Timestamp>;
}

export interface FitRuleTable {
  id: Generated<number>;
  name: string;
  kind: RuleKind;
  condition: string;
  message: string;
  upgrade_category: string | null;
  suggested_part_id: number | null;
  active: Generated<boolean>;
  version: Generated<number>;
  created_at: Generated<Timestamp>;
  updated_at: Generated<Timestamp>;
  updated_by: number | null;
}

export interface FitRuleVersionTable {
  id: Generated<number>;
  rule_id: number;
  version: number;
  name: string;
  kind: RuleKind;
  condition: string;
  message: string;
  upgrade_category: string | null;
  suggested_part_id: number | null;
  active: boolean;
  change_note: Generated<string>;
  changed_by: number | null;
  changed_at: Generated<Timestamp>;
}

export interface CatalogTables {
  part_categories: PartCategoryTable;
  parts: PartTable;
  part_versions: PartVersionTable;
  fit_rules: FitRuleTable;
  fit_rule_versions: FitRuleVersionTable;
}

export type Part = Selectable<PartTable>;
export type NewPart = Insertable<PartTable>;
export type PartUpdate = Updateable<PartTable>;
export type FitRule = Selectable<FitRuleTable>;
export type FitRuleVersion = Selectable<FitRuleVersionTable>;
