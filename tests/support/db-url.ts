// Database URLs for the test runs: the same server as the local default,
// never the demo database.
export const LOCAL_DEFAULT_URL = `postgres://postgres@127.0.0.1:${process.env.TW_PG_PORT ?? "54329"}/torquewright`;

export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

export function testDatabaseUrl(): string {
  return (
    process.env.TEST_DATABASE_URL ??
    withDatabase(process.env.DATABASE_URL ?? LOCAL_DEFAULT_URL, "torquewright_test")
  );
}

export function e2eDatabaseUrl(): string {
  return (
    process.env.E2E_DATABASE_URL ??
    withDatabase(process.env.DATABASE_URL ?? LOCAL_DEFAULT_URL, "torquewright_e2e")
  );
}
