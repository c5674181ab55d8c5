import { cookies } from "next/headers";
import { displayZoneOrUtc, UTC } from "@/lib/display/time";

/** The zone the user chose in the header ("" or absent: automatic). */
export const ZONE_COOKIE = "corelag_tz";
/** The browser's own zone, written by the header's zone picker so server pages can use it. */
export const BROWSER_ZONE_COOKIE = "corelag_browser_tz";

/**
 * The zone times are shown in: the user's choice; else the trace's import zone (when the page is about
 * one trace and its times were read in a named zone other than UTC); else the browser's zone; else UTC.
 */
export async function displayZone(traceZone?: string | null): Promise<string> {
  const jar = await cookies();
  const chosen = jar.get(ZONE_COOKIE)?.value;
  if (chosen) return displayZoneOrUtc(decodeURIComponent(chosen));
  // An import zone of UTC is also the importer's default when no zone was named (times with offsets, or
  // none chosen), so it does not count as the trace's own zone.
  if (traceZone && traceZone !== UTC) return displayZoneOrUtc(traceZone);
  const browser = jar.get(BROWSER_ZONE_COOKIE)?.value;
  return browser ? displayZoneOrUtc(decodeURIComponent(browser)) : UTC;
}

/** The raw choice, for the picker ("" = automatic). */
export async function chosenZone(): Promise<string> {
  const v = (await cookies()).get(ZONE_COOKIE)?.value;
  return v ? displayZoneOrUtc(decodeURIComponent(v)) : "";
}
