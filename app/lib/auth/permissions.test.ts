import { describe, expect, it } from "vitest";
import { can, PERMISSIONS, ROLES, rolesWith, type Permission } from "./permissions";

const everything = Object.keys(PERMISSIONS) as Permission[];

describe("the role table", () => {
  it("the owner may do everything", () => {
    for (const p of everything) expect(can("owner", p), p).toBe(true);
  });

  it("only the owner keeps fit rules, the catalog, rates and staff, and reads the outbox", () => {
    for (const p of [
      "rules:edit",
      "parts:edit",
      "rates:edit",
      "staff:manage",
      "outbox:read",
    ] as const) {
      expect(rolesWith(p), p).toEqual(["owner"]);
    }
  });

  it("the apprentice studies the library and reads the catalog and rules, and changes nothing", () => {
    const allowed = everything.filter((p) => can("apprentice", p)).sort();
    expect(allowed).toEqual([
      "families:read",
      "home:read",
      "library:read",
      "parts:read",
      "rules:read",
    ]);
    expect(can("apprentice", "customers:contact")).toBe(false);
    expect(can("apprentice", "prices:read")).toBe(false);
  });

  it("builders draft packages and send quotes; service writers take requests, keep customers and send quotes", () => {
    expect(can("builder", "packages:edit")).toBe(true);
    expect(can("builder", "quotes:send")).toBe(true);
    expect(can("builder", "requests:edit")).toBe(false);
    expect(can("service_writer", "requests:edit")).toBe(true);
    expect(can("service_writer", "customers:edit")).toBe(true);
    expect(can("service_writer", "keepcheck:edit")).toBe(true);
    expect(can("service_writer", "quotes:send")).toBe(true);
    expect(can("service_writer", "deposits:take")).toBe(true);
    expect(can("service_writer", "packages:edit")).toBe(false);
  });

  it("nobody signed out may do anything", () => {
    for (const p of everything) expect(can(null, p)).toBe(false);
  });

  it("every permission names only known roles", () => {
    for (const p of everything) for (const r of rolesWith(p)) expect(ROLES).toContain(r);
  });
});
