import { describe, it, expect } from "vitest";
import { formatSpan, formatTick, formatTime, timeTicks, zoneLabel } from "@/lib/display/time";
import { fixed, formatC, sig, sigTrim } from "@/lib/display/numbers";

// Expected strings worked by hand from the zones' offsets on 16 June 2026 (IANA tz database: Berlin
// CEST = UTC+2, London BST = UTC+1, São Paulo UTC-3 without DST since 2019, Kolkata UTC+5:30).
const T = Date.parse("2026-06-16T03:00:00Z");

describe("formatTime", () => {
  it("formatTime(t, 'UTC') writes the date, the minute and the zone", () => {
    expect(formatTime(T, "UTC")).toBe("2026-06-16 03:00 UTC");
    expect(formatTime(new Date(T + 30_000), "UTC", { seconds: true })).toBe("2026-06-16 03:00:30 UTC");
    expect(formatTime("2026-06-16T03:00:00.000Z", "UTC")).toBe("2026-06-16 03:00 UTC");
  });

  it("formatTime shows the wall time in the display zone and names the zone", () => {
    expect(formatTime(T, "Europe/Berlin")).toBe("2026-06-16 05:00 CEST");
    expect(formatTime(T, "Europe/London")).toBe("2026-06-16 04:00 BST");
    expect(formatTime(T, "America/Sao_Paulo")).toBe("2026-06-16 00:00 UTC-3");
    expect(formatTime(T, "Asia/Kolkata")).toBe("2026-06-16 08:30 UTC+5:30");
  });

  it("formatTime names winter time after a daylight-saving change (Berlin, January: CET)", () => {
    expect(formatTime(Date.parse("2026-01-10T12:00:00Z"), "Europe/Berlin")).toBe("2026-01-10 13:00 CET");
  });

  it("an unknown zone falls back to UTC rather than failing", () => {
    expect(formatTime(T, "Mars/Olympus")).toBe("2026-06-16 03:00 UTC");
    expect(zoneLabel(T, "Mars/Olympus")).toBe("UTC");
  });

  it("formatSpan writes one date for a span inside one local day", () => {
    expect(formatSpan(T, T + 12 * 3600_000, "Europe/Berlin")).toBe("2026-06-16 05:00 – 17:00 CEST");
    expect(formatSpan(T, T + 24 * 3600_000, "UTC")).toBe("2026-06-16 03:00 UTC – 2026-06-17 03:00 UTC");
  });
});

describe("timeTicks", () => {
  it("timeTicks puts ticks on round local hours of the display zone", () => {
    const ticks = timeTicks(T, T + 12 * 3600_000, "Europe/Berlin", 6);
    expect(ticks.map((t) => formatTick(t, "Europe/Berlin"))).toEqual(["06:00", "08:00", "10:00", "12:00", "14:00", "16:00"]);
  });

  it("timeTicks puts day ticks on local midnights, written as the date", () => {
    const ticks = timeTicks(T, T + 30 * 86400_000, "UTC", 6);
    expect(ticks.map((t) => formatTick(t, "UTC"))[0]).toBe("17 Jun");
    for (const t of ticks) expect(new Date(t).getUTCHours()).toBe(0);
  });
});

describe("numbers", () => {
  it("sig rounds to significant figures (the issue's 2.901649033481937 and 0.033651953124999995)", () => {
    expect(sig(2.901649033481937)).toBe("2.90");
    expect(sig(0.033651953124999995)).toBe("0.0337");
    expect(sig(10452.3)).toBe("10,500");
    expect(sig(99.96)).toBe("100");
    expect(sig(1.23e-7)).toBe("1.23e-7");
  });

  it("sigTrim drops trailing zeros; fixed never writes -0.00; formatC adds the unit", () => {
    expect(sigTrim(0.5)).toBe("0.5");
    expect(sigTrim(1.8345)).toBe("1.8");
    expect(fixed(-0.001, 2)).toBe("0.00");
    expect(formatC(7.654)).toBe("7.65 °C");
    expect(formatC(Number.NaN)).toBe("–");
  });
});
