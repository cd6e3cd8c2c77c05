import type { ColumnType, Generated, Selectable } from "kysely";
import type { Role } from "./core";

// Timestamps with a database default, and nullable ones.
type Ts = ColumnType<Date, Date | string | undefined, Date | string>;
type TsNull = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>;

export interface SessionTable {
  id_hash: string;
  user_id: number;
  created_at: Ts;
  expires_at: Ts;
}

export type AuthTokenKind = "invite" | "reset";

export interface AuthTokenTable {
  id: Generated<number>;
  kind: AuthTokenKind;
  token_hash: string;
  email: string;
  role: Role | null;
  user_id: number | null;
  created_by: number | null;
  created_at: Ts;
  expires_at: Ts;
  used_at: TsNull;
  revoked_at: TsNull;
}

export interface LoginAttemptTable {
  id: Generated<number>;
  email: string;
  ip: string;
  succeeded: boolean;
  created_at: Ts;
}

export type MailStatus = "queued" | "sent" | "failed";

export interface MailMessageTable {
  id: Generated<number>;
  idempotency_key: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string | null;
  status: Generated<MailStatus>;
  attempts: Generated<number>;
  last_error: string | null;
  created_at: Ts;
  sent_at: TsNull;
}

export interface AuthTables {
  sessions: SessionTable;
  auth_tokens: AuthTokenTable;
  login_attempts: LoginAttemptTable;
  mail_messages: MailMessageTable;
}

export type AuthToken = Selectable<AuthTokenTable>;
export type MailMessage = Selectable<MailMessageTable>;
