// A body of the wrong kind, tried on every action of app/routes.ts: JSON or text to a
// form action, no body at all, multipart without its boundary or with a broken part.
// Each is a 4xx with a plain message (415 for a type that is not a form's, 400 for a
// form that cannot be read, or the form's own refusal for an empty one), never a 500,
// and nothing changes.
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import {
  dispatch,
  hostileRequest,
  makeFixtures,
  pathFor,
  rowCounts,
  routeTable,
  type Fixtures,
  type RouteInfo,
} from "../support/hostile";

type Kind = "json" | "text" | "octet" | "none" | "no-boundary" | "broken-part" | "xml";
const bodyOf = (kind: Kind, text: string): RequestInit => {
  switch (kind) {
    case "json":
      return {
        body: JSON.stringify({ intent: "save", text }),
        headers: { "Content-Type": "application/json" },
      };
    case "text":
      return { body: `intent=save&x=${text}`, headers: { "Content-Type": "text/plain" } };
    case "octet":
      return { body: text || "x", headers: { "Content-Type": "application/octet-stream" } };
    case "xml":
      return { body: `<a>${text}</a>`, headers: { "Content-Type": "application/xml" } };
    case "none":
      return {};
    case "no-boundary":
      return {
        body: `--x\r\nContent-Disposition: form-data; name="intent"\r\n\r\nsave\r\n--x--\r\n`,
        headers: { "Content-Type": "multipart/form-data" },
      };
    case "broken-part":
      return {
        body: `--b0undary\r\nContent-Disposition: form-data; name="intent"\r\n${text}`,
        headers: { "Content-Type": "multipart/form-data; boundary=b0undary" },
      };
  }
};
const KINDS: Kind[] = ["json", "text", "octet", "xml", "none", "no-boundary", "broken-part"];

let f: Fixtures;
let routes: RouteInfo[];
beforeAll(async () => {
  f = await makeFixtures();
  routes = await routeTable();
});

describe("bodies of the wrong type", () => {
  it("are 4xx with a plain message on every action, signed in or not, and change nothing", async () => {
    const byStatus = new Map<number, number>();
    const refusedType = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...KINDS),
        fc.string({ maxLength: 30 }),
        fc.boolean(),
        async (kind, text, signedIn) => {
          for (const r of routes.filter((x) => x.hasAction)) {
            const path = pathFor(r.pattern, f.realParams(r.file));
            const before = await rowCounts(f);
            const a = await dispatch(
              hostileRequest(f, signedIn ? "owner" : null, path, {
                method: "POST",
                ...bodyOf(kind, text),
              }),
            );
            expect(a.status, `POST ${path} (${kind}): ${a.message}`).toBeLessThan(500);
            byStatus.set(a.status, (byStatus.get(a.status) ?? 0) + 1);
            if (a.status >= 400) {
              expect(a.message.trim(), `POST ${path} (${kind})`).not.toBe("");
              expect(a.message).not.toMatch(/TypeError|undefined|Unexpected token/);
              expect(await rowCounts(f)).toEqual(before);
            }
            if (a.status === 415) refusedType.add(r.file);
          }
        },
      ),
      { numRuns: 30 },
    );
    // the type branch was reached on every action that reads a body
    const readers = routes
      .filter((r) => r.hasAction && r.file !== "routes/logout.ts")
      .map((r) => r.file);
    expect([...refusedType].sort()).toEqual(readers.sort());
    expect(byStatus.get(415) ?? 0).toBeGreaterThanOrEqual(30);
    expect(byStatus.get(500)).toBeUndefined();
  });

  it("the sign-in form answers JSON with 415 in plain words, and still signs in from its form", async () => {
    const json = await dispatch(
      hostileRequest(f, null, "/login", {
        method: "POST",
        body: JSON.stringify({ email: f.users.builder.email, password: f.users.builder.password }),
        headers: { "Content-Type": "application/json" },
      }),
    );
    expect(json.status).toBe(415);
    expect(json.message).toBe(
      "This address takes a form (URL-encoded or multipart fields), not this kind of body.",
    );
    const { asFromPage } = await import("../support/honeypot");
    const ok = await dispatch(
      hostileRequest(f, null, "/login", {
        method: "POST",
        body: new URLSearchParams(
          asFromPage({ email: f.users.builder.email, password: f.users.builder.password }),
        ),
      }),
    );
    expect(ok.status).toBe(302);
    expect(ok.headers?.get("Location")).toBe("/");
  });

  it("the import answers a multipart without a boundary or with a broken part plainly", async () => {
    const nob = await dispatch(
      hostileRequest(f, "owner", "/parts/import", { method: "POST", ...bodyOf("no-boundary", "") }),
    );
    expect(nob.status).toBe(415);
    expect(nob.message).toBe("The multipart form has no boundary; it cannot be read.");
    const broken = await dispatch(
      hostileRequest(f, "owner", "/parts/import", {
        method: "POST",
        ...bodyOf("broken-part", "x"),
      }),
    );
    expect(broken.status).toBe(400);
    expect(broken.message).toBe("The form could not be read; reload the page and send it again.");
  });

  it("a bench post with no body is refused in the bench's words", async () => {
    const a = await dispatch(
      hostileRequest(f, "builder", `/packages/${f.packageId}/bench`, { method: "POST" }),
    );
    expect(a.status).toBe(400);
    expect(a.value).toEqual({
      ok: false,
      errors: {
        form: ["The bench did not understand that change; reload the page and try again."],
      },
    });
  });
});
