// The same-origin check of posts compares the Origin (or, without it, the Referer) with
// APP_URL only. The request's own URL is made from the Host header the sender wrote, so
// a post whose Host and Origin both name another site is still another site's.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { isSameOrigin, requireSameOrigin } from "~/lib/auth/origin.server";
import { env } from "~/lib/env.server";

const ours = () => new URL(env().APP_URL).origin;
const post = (url: string, headers: Record<string, string>) =>
  new Request(url, { method: "POST", headers, body: "a=1" });

describe("isSameOrigin", () => {
  it("accepts our Origin, or our Referer when Origin is missing", () => {
    expect(isSameOrigin(post(`${ours()}/login`, { Origin: ours() }))).toBe(true);
    expect(isSameOrigin(post(`${ours()}/login`, { Referer: `${ours()}/login?x=1` }))).toBe(true);
    expect(isSameOrigin(new Request(`http://elsewhere.test/login`))).toBe(true); // a GET
  });

  it("refuses a post with neither, with Origin null, or with a Referer that is not a URL", () => {
    expect(isSameOrigin(post(`${ours()}/login`, {}))).toBe(false);
    expect(isSameOrigin(post(`${ours()}/login`, { Origin: "null" }))).toBe(false);
    expect(isSameOrigin(post(`${ours()}/login`, { Referer: "not a url" }))).toBe(false);
  });

  it("never takes the request's own host for ours (property: any other host, both headers)", () => {
    let reached = 0;
    fc.assert(
      fc.property(
        fc.domain(),
        fc.constantFrom("http", "https"),
        fc.option(fc.integer({ min: 1, max: 65535 }), { nil: undefined }),
        fc.boolean(),
        (host, scheme, port, viaReferer) => {
          const other = new URL(`${scheme}://${host}${port ? `:${port}` : ""}`).origin;
          fc.pre(other !== ours());
          reached++;
          const headers: Record<string, string> = viaReferer
            ? { Referer: `${other}/parts/new` }
            : { Origin: other };
          // the URL React Router builds from a Host header of the sender's choice
          expect(isSameOrigin(post(`${other}/parts/new`, headers))).toBe(false);
        },
      ),
      { numRuns: 300 },
    );
    expect(reached).toBeGreaterThan(250);
  });

  it("answers a refused post with 403 and the plain reason", () => {
    let thrown: any;
    try {
      requireSameOrigin(post("http://evil.test/login", { Origin: "http://evil.test" }));
    } catch (e) {
      thrown = e;
    }
    expect(thrown?.init?.status).toBe(403);
    expect(thrown?.data).toBe(
      "This form was sent from another site, so it was refused. Open the page again and send it from there.",
    );
  });
});
