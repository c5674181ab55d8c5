import { ruleChannel, type LimitSet } from "../exposure/limits";
import type { Pack } from "../thermal/definitions";
import { displayOf, type DesignVariable } from "./vary";

/** A rule that the chosen variable cannot bring to a pass, found before the search, with what to do about it. */
export interface RuleNote {
  id: string;
  channel: string;
  /** "independent": the rule judges the air, which the variable does not change; "fails-throughout": it fails at both ends of the range */
  kind: "independent" | "fails-throughout";
  advice: string;
}

/** Air rules judge the ambient itself: no pack, coolant or start temperature changes them. */
export function independentRules(limits: LimitSet, variable: DesignVariable, pack: Pack | undefined): RuleNote[] {
  const name = displayOf(variable, pack).name;
  return limits.rules
    .filter((r) => ruleChannel(r) === "air")
    .map((r) => ({
      id: r.id,
      channel: ruleChannel(r),
      kind: "independent" as const,
      advice: `rule ${r.id} judges the air, which no ${name} changes: drop it from the limit set used for design, or change the ambient profile; judge real shipments against it in a review`,
    }));
}

