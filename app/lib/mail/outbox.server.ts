// Reads the local mail catcher's API (scripts/services/mail-catcher.ts) for /dev/outbox.
import { data } from "react-router";
import { env } from "../env.server";

export type OutboxSummary = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  receivedAt: string;
};
export type OutboxMessage = OutboxSummary & { text: string; html: string | null };

/** The catcher's base URL; 404 when this deployment sends real mail. */
export function requireLocalMail(): string {
  const url = env().LOCAL_MAIL_API_URL;
  if (!url) throw data("The outbox exists only with the local mail server.", { status: 404 });
  return url.replace(/\/$/, "");
}

export async function fetchOutbox<T>(
  base: string,
  path: string,
): Promise<{ ok: true; value: T } | { ok: false; status: number; reason: string }> {
  try {
    const res = await fetch(`${base}${path}`, { signal: AbortSignal.timeout(3000) });
    if (!res.ok)
      return { ok: false, status: res.status, reason: `the mail server answered ${res.status}` };
    return { ok: true, value: (await res.json()) as T };
  } catch (e) {
    return { ok: false, status: 503, reason: e instanceof Error ? e.message : String(e) };
  }
}
