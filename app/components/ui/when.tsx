// A date in the shop's one style and time zone (from the root loader), as a <time>.
import { useRouteLoaderData } from "react-router";
import { DEFAULT_TIME_ZONE, formatDate } from "~/lib/format";

export function useShopTimeZone(): string {
  const root = useRouteLoaderData("root") as { timeZone?: string } | undefined;
  return root?.timeZone ?? DEFAULT_TIME_ZONE;
}

/** `time`: also the hour, for saves, sends and changes. */
export function When({ at, time = false }: { at: string | Date; time?: boolean }) {
  const tz = useShopTimeZone();
  const iso = at instanceof Date ? at.toISOString() : at;
  return (
    <time dateTime={iso} className="num">
      {formatDate(iso, tz, { time })}
    </time>
  );
}
