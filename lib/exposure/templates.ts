import type { LimitSet } from "./limits";

/** A starting point a user copies and adjusts. Every template names its source and defers to local rules. */
export interface LimitTemplate {
  key: string;
  title: string;
  source: string;
  limits: LimitSet;
}

const DEFER = "Local regulations and your own food-safety plan govern; adjust before use.";

export const LIMIT_TEMPLATES: readonly LimitTemplate[] = [
  {
    key: "chilled-cold-holding-5C",
    title: "Chilled food, cold holding at 5 °C with a 4-hour allowance",
    source:
      "US FDA Food Code: cold holding at 5 °C (41 °F) or below, §3-501.16; time as a public health control, at most 4 hours, §3-501.19. " + DEFER,
    limits: {
      name: "Chilled food, 5 °C / 4 h (from template)",
      sensor_accuracy_K: 0.5,
      rules: [{ id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 240 }],
    },
  },
  {
    key: "cooling-cooked-food",
    title: "Cooling cooked food: 57 °C to 21 °C within 2 hours, and to 5 °C within 6 hours in total",
    source:
      "US FDA Food Code, §3-501.14 (cooling). Written as time above each temperature, so the trace must start when the food is at 57 °C and cooling begins. " + DEFER,
    limits: {
      name: "Cooling cooked food (from template)",
      sensor_accuracy_K: 0.5,
      rules: [
        { id: "core-above-21C-2h", channel: "core", above_C: 21, max_cumulative_min: 120 },
        { id: "core-above-5C-6h", channel: "core", above_C: 5, max_cumulative_min: 360 },
      ],
    },
  },
  {
    key: "chilled-8C-uk",
    title: "Chilled food, 8 °C with a one-off tolerance under 4 hours",
    source: "UK food hygiene regulations, Schedule 4: chilled food not above 8 °C, one-off tolerance under 4 hours. " + DEFER,
    limits: {
      name: "Chilled food, 8 °C (from template)",
      sensor_accuracy_K: 0.5,
      rules: [{ id: "core-above-8C", channel: "core", above_C: 8, max_continuous_min: 240 }],
    },
  },
  {
    key: "quick-frozen-18C",
    title: "Quick-frozen food, −18 °C with brief rises of at most 3 °C in transport",
    source: "EU Directive 89/108/EEC on quick-frozen foodstuffs: −18 °C or colder, brief upward fluctuations of at most 3 °C during transport. " + DEFER,
    limits: {
      name: "Quick-frozen, −18 °C (from template)",
      sensor_accuracy_K: 0.5,
      rules: [{ id: "core-above-minus18C", channel: "core", above_C: -18, max_peak_C: -15 }],
    },
  },
];
