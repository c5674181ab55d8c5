"use client";

import { useEffect, useMemo, useState } from "react";
import { useRouter } from "next/navigation";

const ZONE_COOKIE = "corelag_tz";
const BROWSER_ZONE_COOKIE = "corelag_browser_tz";
const YEAR_S = 365 * 24 * 3600;

function readCookie(name: string): string | undefined {
  const hit = document.cookie.split("; ").find((c) => c.startsWith(`${name}=`));
  return hit ? decodeURIComponent(hit.slice(name.length + 1)) : undefined;
}
function writeCookie(name: string, value: string) {
  document.cookie = `${name}=${encodeURIComponent(value)}; path=/; max-age=${value ? YEAR_S : 0}; samesite=lax`;
}

/**
 * The display time zone, chosen once for every page (a cookie). "Automatic" shows each trace in the
 * zone it was imported in, and everything else in this browser's zone. Stored times stay UTC.
 */
export function ZonePicker({ chosen }: { chosen: string }) {
  const router = useRouter();
  const [value, setValue] = useState(chosen);
  const [browserZone, setBrowserZone] = useState<string | null>(null);
  useEffect(() => {
    const tz = Intl.DateTimeFormat().resolvedOptions().timeZone;
    setBrowserZone(tz);
    if (readCookie(BROWSER_ZONE_COOKIE) !== tz) {
      writeCookie(BROWSER_ZONE_COOKIE, tz);
      router.refresh();
    }
  }, [router]);
  const zones = useMemo(() => {
    const all = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
    return ["UTC", ...all.filter((z) => z !== "UTC")];
  }, []);
  return (
    <label className="zone-picker">
      <span>Times in</span>
      <select
        value={value}
        data-testid="zone-picker"
        onChange={(e) => {
          setValue(e.target.value);
          writeCookie(ZONE_COOKIE, e.target.value);
          router.refresh();
        }}
      >
        <option value="">auto: a trace&apos;s own zone, else {browserZone ?? "this browser's"}</option>
        {value && !zones.includes(value) && <option value={value}>{value}</option>}
        {zones.map((z) => <option key={z} value={z}>{z}</option>)}
      </select>
    </label>
  );
}

/** In the browser: the zone the user chose in the header, else this browser's own. */
export function clientDisplayZone(): string {
  return readCookie(ZONE_COOKIE) || Intl.DateTimeFormat().resolvedOptions().timeZone;
}
