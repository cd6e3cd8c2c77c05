import { form, requestAs, type TestUser } from "./auth";
// Calling a route's loader or action the way React Router does, and reading what it
// answered or threw (a Response, or data() with a status) as one shape.
export type RouteOutcome = { status: number; value: any; location: string | null };

export async function run(fn: () => Promise<unknown>): Promise<RouteOutcome> {
  try {
    return read(await fn());
  } catch (thrown: any) {
    if (thrown instanceof Response || thrown?.init) return read(thrown);
    throw thrown;
  }
}

function read(v: any): RouteOutcome {
  if (v instanceof Response)
    return { status: v.status, value: v, location: v.headers.get("Location") };
  return { status: v?.init?.status ?? 200, value: v?.data ?? v, location: null };
}

/** The loader/action arguments for a request (and the route's params). */
export const args = (request: Request, params: Record<string, string> = {}) =>
  ({ request, params, context: {} }) as never;

/** A same-origin form post as this user. */
export async function post(
  who: Pick<TestUser, "id">,
  path: string,
  body: Record<string, string>,
): Promise<Request> {
  return requestAs(who, path, { method: "POST", body: form(body) });
}
