import { describe, it, expect } from "vitest";
import { csvRow } from "@/lib/review/csv";
import { timeInBands } from "@/lib/exposure/bands";
import { verifyAuditChain, auditHash, GENESIS_HASH, type AuditEntryRecord } from "@/lib/review/audit";

describe("csvRow", () => {
  it("csvRow neutralises cells a spreadsheet would run as formulas", () => {
    expect(csvRow(["=cmd|' /C calc'!A0", "+1+1", "-2+3", "@SUM(A1)", "plain"])).toBe(`'=cmd|' /C calc'!A0,'+1+1,'-2+3,'@SUM(A1),plain`);
  });
  it("csvRow keeps numbers and signed numeric text as they are, and quotes commas and quotes", () => {
    expect(csvRow([-3.5, "-3.5000", "a,b", 'say "hi"'])).toBe(`-3.5,-3.5000,"a,b","say ""hi"""`);
  });
});

describe("timeInBands", () => {
  it("timeInBands splits each interval by the share of its linear sweep in each band", () => {
    // 0 → 10 °C over 100 s, then flat at 10 for 50 s; edges 5 and 8:
    // below 5: 50 s; 5–8: 30 s; 8 and above: 20 s + 50 s = 70 s
    const t = Float64Array.of(0, 100, 150);
    const v = Float64Array.of(0, 10, 10);
    expect(timeInBands(t, v, [5, 8])).toEqual([50, 30, 70]);
  });
});

describe("verifyAuditChain", () => {
  const make = (n: number): AuditEntryRecord[] => {
    const out: AuditEntryRecord[] = [];
    let prev = GENESIS_HASH;
    for (let i = 1; i <= n; i++) {
      const f = { seq: i, at: new Date(Date.UTC(2026, 0, 1, 0, i)), action: "run", entity: "review", entityId: `r${i}`, actor: "web", details: { n: i }, prevHash: prev };
      const hash = auditHash(f);
      out.push({ ...f, hash });
      prev = hash;
    }
    return out;
  };

  it("verifyAuditChain accepts an intact chain", () => {
    expect(verifyAuditChain(make(5))).toEqual({ entries: 5, ok: true, problems: [] });
  });
  it("verifyAuditChain detects a changed entry", () => {
    const c = make(5);
    c[2] = { ...c[2]!, details: { n: 99 } };
    expect(verifyAuditChain(c).problems).toEqual(["entry 3 (run review r3): its content no longer matches its hash"]);
  });
  it("verifyAuditChain detects a deleted entry", () => {
    const c = make(5);
    c.splice(1, 1);
    const r = verifyAuditChain(c);
    expect(r.ok).toBe(false);
    expect(r.problems[0]).toMatch(/position 2 has number 3/);
    expect(r.problems).toContain("entry 3: does not follow the entry before it (chain broken)");
  });
  it("verifyAuditChain detects reordered entries", () => {
    const c = make(5);
    [c[1], c[2]] = [c[2]!, c[1]!];
    const r = verifyAuditChain(c);
    expect(r.ok).toBe(false);
    expect(r.problems.some((p) => /chain broken/.test(p))).toBe(true);
  });
});
