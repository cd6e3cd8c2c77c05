// Reading the local mail catcher from tests, over its HTTP API.
export type CaughtSummary = { id: string; to: string[]; subject: string; receivedAt: string };
export type Caught = CaughtSummary & {
  text: string;
  html: string | null;
  messageId: string | null;
};

export async function waitFor<T>(
  probe: () => Promise<T | null | undefined | false>,
  timeoutMs = 15_000,
  what = "condition",
): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function listCaught(apiUrl: string): Promise<CaughtSummary[]> {
  const res = await fetch(`${apiUrl}/messages`);
  return (await res.json()) as CaughtSummary[];
}

export async function mailFor(apiUrl: string, to: string, timeoutMs = 15_000): Promise<Caught> {
  const summary = await waitFor(
    async () => (await listCaught(apiUrl)).find((m) => m.to.includes(to)),
    timeoutMs,
    `an e-mail to ${to}`,
  );
  const res = await fetch(`${apiUrl}/messages/${summary.id}`);
  return (await res.json()) as Caught;
}

export function linkIn(text: string, pathPrefix: string): URL {
  const match = text
    .match(/https?:\/\/\S+/g)
    ?.map((u) => new URL(u))
    .find((u) => u.pathname.startsWith(pathPrefix));
  if (!match) throw new Error(`no ${pathPrefix} link in:\n${text}`);
  return match;
}
