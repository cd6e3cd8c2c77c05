import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely";

export type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export const ROLES = ["owner", "builder", "service_writer", "apprentice"] as const;
export type Role = (typeof ROLES)[number];

export interface ShopTable {
  id: Generated<number>;
  name: string;
  city: string;
  phone: string;
  email: string;
  labour_rate_cents: number;
  address: Generated<string>;
  /** basis points: 825 = 8.25 % */
  tax_rate_bp: Generated<number>;
  deposit_kind: Generated<DepositKind>;
  /** basis points of the quote for "percent", cents for "fixed" */
  deposit_value: Generated<number>;
  /** IANA zone the shop's dates are shown in */
  time_zone: Generated<string>;
  created_at: Generated<Timestamp>;
  updated_at: Timestamp;
}

export const DEPOSIT_KINDS = ["percent", "fixed"] as const;
export type DepositKind = (typeof DEPOSIT_KINDS)[number];

export interface ShopSettingChangeTable {
  id: Generated<number>;
  shop_id: number;
  field: string;
  before: string;
  after: string;
  changed_by: number | null;
  changed_at: Timestamp;
}

export interface UserTable {
  id: Generated<number>;
  email: string;
  name: string;
  role: Role;
  password_hash: string | null;
  disabled_at: Timestamp | null;
  created_at: Generated<Timestamp>;
  updated_at: Generated<Timestamp>;
}

export interface CustomerTable {
  id: Generated<number>;
  name: string;
  email: string | null;
  phone: string | null;
  city: string | null;
  notes: string;
  created_at: Generated<Timestamp>;
}

export interface BikeTable {
  id: Generated<number>;
  customer_id: number;
  year: number;
  model: string;
  vin: string | null;
  engine_ci: number | null;
  mileage: number | null;
  notes: string;
  created_at: Generated<Timestamp>;
}

export interface CoreTables {
  shop: ShopTable;
  shop_setting_changes: ShopSettingChangeTable;
  users: UserTable;
  customers: CustomerTable;
  bikes: BikeTable;
}

export type User = Selectable<UserTable>;
export type NewUser = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type Customer = Selectable<CustomerTable>;
export type Bike = Selectable<BikeTable>;
export type Shop = Selectable<ShopTable>;
