import type { Generated } from "kysely";
import type { Timestamp } from "./core";

/** One caution limit the owner changed; limits without a row take their default. */
export interface CautionLimitTable {
  key: string;
  value_num: number | null;
  value_text: string | null;
  updated_by: number | null;
  updated_at: Timestamp;
}

/** Every change of a caution limit: who, when, from what to what. */
export interface CautionLimitChangeTable {
  id: Generated<number>;
  key: string;
  /** the value replaced (its default when the owner had not set it before) */
  old_value: string | null;
  new_value: string;
  changed_by: number | null;
  changed_at: Timestamp;
}

export interface SettingsTables {
  caution_limits: CautionLimitTable;
  caution_limit_changes: CautionLimitChangeTable;
}
