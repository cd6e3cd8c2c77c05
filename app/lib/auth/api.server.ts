// The JSON routes ask the same questions as the pages (signed in? same origin? allowed?)
// but answer in JSON: 401 when nobody is signed in, 403 when the role may not, instead
// of the pages' redirect to the sign-in form.
import type { SessionUser } from "./auth.server";
import { getUser } from "./auth.server";
import { isSameOrigin } from "./origin.server";
import { can, ROLE_LABELS, type Permission } from "./permissions";

const JSON_NO_STORE = { "Cache-Control": "private, no-store" };

export async function requireApiPermission(
  request: Request,
  permission: Permission,
): Promise<SessionUser> {
  if (!isSameOrigin(request)) {
    throw Response.json(
      {
        error:
          "Requests that change or compute must come from this site's own pages (Origin header).",
      },
      { status: 403, headers: JSON_NO_STORE },
    );
  }
  const user = await getUser(request);
  if (!user)
    throw Response.json(
      { error: "Sign in first: send the session cookie." },
      { status: 401, headers: JSON_NO_STORE },
    );
  if (!can(user.role, permission)) {
    throw Response.json(
      { error: `Your role (${ROLE_LABELS[user.role].toLowerCase()}) may not use this.` },
      { status: 403, headers: JSON_NO_STORE },
    );
  }
  return user;
}
