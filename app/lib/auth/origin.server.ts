// Posts are accepted only from our own pages: the Origin header (sent by every current
// browser on a POST) must be the app's own origin.
import { data } from "react-router";
import { env } from "../env.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function isSameOrigin(request: Request): boolean {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return true;
  const origin = request.headers.get("Origin");
  if (!origin) {
    // Without Origin, fall back to Referer; a post with neither is refused.
    const referer = request.headers.get("Referer");
    if (!referer) return false;
    try {
      return allowedOrigins(request).has(new URL(referer).origin);
    } catch {
      return false;
    }
  }
  return allowedOrigins(request).has(origin);
}

function allowedOrigins(request: Request): Set<string> {
  return new Set([new URL(env().APP_URL).origin, new URL(request.url).origin]);
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
