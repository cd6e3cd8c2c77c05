// The typed database. Each feature keeps its tables in db/schema/<feature>.ts;
// this interface joins them.
import type { CoreTables } from "./schema/core";
import type { AuthTables } from "./schema/auth";
import type { CatalogTables } from "./schema/catalog";
import type { PackageTables } from "./schema/packages";
import type { SettingsTables } from "./schema/settings";
import type { RequestTables } from "./schema/requests";
import type { DynoTables } from "./schema/dyno";
import type { QuoteTables } from "./schema/quotes";

export interface Database
  extends
    CoreTables,
    AuthTables,
    CatalogTables,
    PackageTables,
    SettingsTables,
    RequestTables,
    DynoTables,
    QuoteTables {}

export type * from "./schema/core";
export type * from "./schema/auth";
export type * from "./schema/catalog";
export type * from "./schema/packages";
export type * from "./schema/settings";
export type * from "./schema/requests";
export type * from "./schema/dyno";
export type * from "./schema/quotes";
