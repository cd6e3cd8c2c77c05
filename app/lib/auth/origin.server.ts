// Posts are accepted only from our own pages: the Origin header (sent by every current
// browser on a POST) must be the app's own origin, the one in APP_URL.
import { data } from "react-router";
import { env } from "../env.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function isSameOrigin(request: Request): boolean {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return true;
  // Only APP_URL says what our origin is: the request's own URL is built from its Host
  // header, which the sender chooses.
  const ours = new URL(env().APP_URL).origin;
  const origin = request.headers.get("Origin");
  if (origin) return origin === ours;
  // Without Origin, fall back to Referer; a post with neither is refused.
  const referer = request.headers.get("Referer");
  if (!referer) return false;
  try {
    return new URL(referer).origin === ours;
  } catch {
    return false;
  }
}

export function requireSameOrigin(request: Request): void {
  if (!isSameOrigin(request)) {
    throw data(
      "This form was sent from another site, so it was refused. Open the page again and send it from there.",
      {
        status: 403,
      },
    );
  }
}
