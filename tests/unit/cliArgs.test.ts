import { describe, it, expect } from "vitest";
import { joinNegativeValues, parseArgs } from "@/lib/cli/args";

describe("joinNegativeValues", () => {
  const options = { missing: { type: "string" }, min: { type: "string", short: "m" }, "fit-initial": { type: "boolean" } } as const;
  it("joinNegativeValues joins a string flag with a following negative number or list", () => {
    expect(joinNegativeValues(["--missing", "-999,9999", "--min", "-.5", "-m", "-3"], options)).toEqual(["--missing=-999,9999", "--min=-.5", "--min=-3"]);
  });
  it("joinNegativeValues leaves boolean flags, other flags and already-joined values alone", () => {
    expect(joinNegativeValues(["--fit-initial", "-5", "--missing=-1", "--missing", "--min"], options)).toEqual(["--fit-initial", "-5", "--missing=-1", "--missing", "--min"]);
  });
  it("parseArgs reads `--missing -999,9999` (node's own parseArgs calls it ambiguous)", () => {
    const { values } = parseArgs({ args: ["--missing", "-999,9999"], options, strict: true });
    expect(values.missing).toBe("-999,9999");
  });
});
