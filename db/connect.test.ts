import { sql } from "kysely";
import { describe, expect, it } from "vitest";
import { createDb, isConnectionError } from "./connect";

// Which errors mean "the database is away" (SQLSTATE codes from the PostgreSQL 15 manual,
// Appendix A "PostgreSQL Error Codes"; socket codes from Node's errors documentation).
describe("isConnectionError", () => {
  const coded = (code: string, message = "x") => Object.assign(new Error(message), { code });

  it.each([
    "57P01",
    "57P02",
    "57P03",
    "08006",
    "08001",
    "08003",
    "53300",
    "ECONNREFUSED",
    "ECONNRESET",
  ])("is true for code %s", (code) => expect(isConnectionError(coded(code))).toBe(true));

  it.each(["23505", "22P02", "42P01", "40001", "P0001"])(
    "is false for a query's own error %s",
    (code) => expect(isConnectionError(coded(code))).toBe(false),
  );

  it("reads pg's codeless messages, causes and aggregate errors", () => {
    expect(isConnectionError(new Error("Connection terminated unexpectedly"))).toBe(true);
    expect(isConnectionError(new Error("wrapped", { cause: coded("ECONNREFUSED") }))).toBe(true);
    expect(isConnectionError(new AggregateError([new Error("a"), coded("ECONNREFUSED")]))).toBe(
      true,
    );
    expect(isConnectionError(new Error("syntax error at or near"))).toBe(false);
    expect(isConnectionError(null)).toBe(false);
    expect(isConnectionError("57P01")).toBe(false);
  });

  it("passes a refused connection through mapError, and nothing else", async () => {
    const seen: unknown[] = [];
    const db = createDb("postgres://postgres@127.0.0.1:1/none", 1, {
      mapError: (e) => {
        seen.push(e);
        return new Error("mapped");
      },
    });
    await expect(sql`select 1`.execute(db)).rejects.toThrow("mapped");
    expect(seen).toHaveLength(1);
    expect(isConnectionError(seen[0])).toBe(true);
    await db.destroy();
  });
});
