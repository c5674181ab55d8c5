import { describe, it, expect } from "vitest";
import { dayEnd, dayStart, listParamsSchema, nonEmpty } from "@/app/components/listParams";
import { resolvePage } from "@/lib/db/page";

describe("list parameters", () => {
  it("dayStart and dayEnd bound a whole day in the display zone (2026-06-16 in Berlin is UTC+2, CEST)", () => {
    expect(dayStart("2026-06-16", "Europe/Berlin")!.toISOString()).toBe("2026-06-15T22:00:00.000Z");
    expect(dayEnd("2026-06-16", "Europe/Berlin")!.toISOString()).toBe("2026-06-16T22:00:00.000Z");
    expect(dayStart("2026-06-16", "UTC")!.toISOString()).toBe("2026-06-16T00:00:00.000Z");
    // the spring change in Berlin (2026-03-29, 02:00 → 03:00) makes a 23-hour day
    expect(dayEnd("2026-03-29", "Europe/Berlin")!.getTime() - dayStart("2026-03-29", "Europe/Berlin")!.getTime()).toBe(23 * 3600_000);
    expect(dayStart(undefined, "UTC")).toBeUndefined();
  });

  it("listParamsSchema ignores a malformed page or search instead of failing the page", () => {
    expect(listParamsSchema.parse(nonEmpty({ page: "2", q: "route" }))).toEqual({ page: 2, q: "route" });
    expect(listParamsSchema.parse(nonEmpty({ page: "-1", q: "" }))).toEqual({});
    expect(listParamsSchema.parse(nonEmpty({ page: "abc", q: ["a", "b"] }))).toEqual({});
  });

  it("resolvePage keeps the page inside 1…pages and the size at most 200", () => {
    expect(resolvePage({ page: 5, pageSize: 10 }, 31)).toEqual({ page: 4, pageSize: 10, pages: 4, skip: 30 });
    expect(resolvePage({ pageSize: 10_000 }, 0)).toEqual({ page: 1, pageSize: 200, pages: 1, skip: 0 });
  });
});
