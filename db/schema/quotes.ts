import type { ColumnType, Generated, Selectable } from "kysely";
import type { Timestamp } from "./core";

type JsonCol<T> = ColumnType<T, T | string, T | string>;
// bigint columns: db/connect.ts reads int8 as a JavaScript number (cents stay far below 2^53)
type Cents = ColumnType<number, number | string, number | string>;

export interface LabourJobTable {
  id: Generated<number>;
  name: string;
  hours_hundredths: number;
  slots: ColumnType<string[], string[] | undefined, string[]>;
  description: Generated<string>;
  active: Generated<boolean>;
  updated_by: number | null;
  updated_at: Timestamp;
}

export interface QuoteSettingsTable {
  id: number;
  supplies_bp: Generated<number>;
  valid_days: Generated<number>;
  updated_by: number | null;
  updated_at: Timestamp;
}

export interface QuoteDraftTable {
  package_id: number;
  extra_lines: JsonCol<unknown>;
  discount: JsonCol<unknown>;
  deposit: JsonCol<unknown> | null;
  note: Generated<string>;
  updated_by: number | null;
  updated_at: Timestamp;
}

export const QUOTE_STATUSES = [
  "sent",
  "changes_requested",
  "approved",
  "superseded",
  "withdrawn",
] as const;
export type QuoteStatus = (typeof QUOTE_STATUSES)[number];

export interface QuoteVersionTable {
  id: Generated<number>;
  package_id: number;
  number: number;
  package_revision: number;
  lines: JsonCol<unknown>;
  terms: JsonCol<unknown>;
  subtotal_cents: Cents;
  discount_cents: Cents;
  tax_cents: Cents;
  total_cents: Cents;
  deposit_cents: Cents;
  summary: JsonCol<unknown>;
  customer_name: string;
  customer_email: string;
  status: ColumnType<QuoteStatus, QuoteStatus | undefined, QuoteStatus>;
  token_hash: string;
  expires_at: Timestamp;
  sent_by: number | null;
  sent_at: Timestamp;
  approved_at: Timestamp | null;
}

export const PAYMENT_STATUSES = [
  "open",
  "paid",
  "declined",
  "expired",
  "refunded",
  "partly_refunded",
] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];

export interface PaymentTable {
  id: Generated<number>;
  quote_version_id: number;
  package_id: number;
  checkout_session_id: string;
  payment_intent_id: string | null;
  amount_cents: Cents;
  refunded_cents: ColumnType<number, number | string | undefined, number | string>;
  status: ColumnType<PaymentStatus, PaymentStatus | undefined, PaymentStatus>;
  failure: string | null;
  created_at: Timestamp;
  paid_at: Timestamp | null;
  updated_at: Timestamp;
}

export interface PaymentEventTable {
  event_id: string;
  type: string;
  payload: JsonCol<unknown>;
  received_at: Timestamp;
  applied_at: Timestamp | null;
  outcome: string;
}

export interface CustomerMessageTable {
  id: Generated<number>;
  package_id: number;
  quote_version_id: number | null;
  body: string;
  created_at: Timestamp;
  read_at: Timestamp | null;
  read_by: number | null;
}

export interface QuoteTables {
  labour_jobs: LabourJobTable;
  quote_settings: QuoteSettingsTable;
  quote_drafts: QuoteDraftTable;
  quote_versions: QuoteVersionTable;
  payments: PaymentTable;
  payment_events: PaymentEventTable;
  customer_messages: CustomerMessageTable;
}

export type LabourJob = Selectable<LabourJobTable>;
export type QuoteVersion = Selectable<QuoteVersionTable>;
export type Payment = Selectable<PaymentTable>;
