// What the quote needs from the bike and its keep-check: the part each slot carries now
// (so only changed slots are priced) and the installed parts marked for replacement.
import type { Db } from "../db.server";

export type KeepCheckForQuote = {
  /** slot key → the part id the bike carries there now */
  baseline: Record<string, number | null>;
  replace: { slot: string | null; partId: number; reason: string }[];
};

export async function keepCheckForQuote(_db: Db, _packageId: number): Promise<KeepCheckForQuote> {
  return { baseline: {}, replace: [] };
}
