import { z } from "../zod";

export const checklistCategories = ["inspection", "safety", "recap", "alignment", "mechanical", "test"] as const;
export type ChecklistCategory = (typeof checklistCategories)[number];

/**
 * Rule codes, in the order the work is done at the bench: intake inspection; make the set safe to work on
 * (isolation, discharge); safety parts and the cord; the recap; the battery compartment; only then the
 * first power-up through a limiter, fault finding and the powered checks; the mechanics the dial depends
 * on; alignment; the tests; burn-in last. Minutes in the shop policy are keyed by these; a line's own code
 * is the rule code, with ".<ifKHz>" or ".<bandIndex>" appended for rules that repeat per IF or per band.
 */
export const ruleCodes = [
  "inspect.intake",
  "safety.isolation-bench",
  "safety.discharge-filter-caps",
  "inspect.tubes",
  "safety.y-capacitor",
  "safety.polarized-plug-fuse",
  "safety.fuse",
  "safety.line-cord",
  "safety.selenium",
  "recap.electrolytic",
  "recap.paper",
  "mech.battery-compartment",
  "safety.current-limited-power-up",
  "inspect.transistors",
  "inspect.fault-find",
  "mech.clean-controls",
  "mech.dial-cord",
  "align.if",
  "align.fm-detector",
  "align.tracking",
  "align.dial",
  "test.voltages",
  "test.leakage",
  "test.burn-in",
] as const;
export type RuleCode = (typeof ruleCodes)[number];
export const ruleCodeSchema = z.enum(ruleCodes);

export const ruleCategory: Record<RuleCode, ChecklistCategory> = {
  "inspect.intake": "inspection",
  "inspect.tubes": "inspection",
  "inspect.transistors": "inspection",
  "inspect.fault-find": "inspection",
  "safety.isolation-bench": "safety",
  "safety.discharge-filter-caps": "safety",
  "safety.current-limited-power-up": "safety",
  "safety.y-capacitor": "safety",
  "safety.polarized-plug-fuse": "safety",
  "safety.fuse": "safety",
  "safety.line-cord": "safety",
  "safety.selenium": "safety",
  "recap.electrolytic": "recap",
  "recap.paper": "recap",
  "align.if": "alignment",
  "align.fm-detector": "alignment",
  "align.tracking": "alignment",
  "align.dial": "alignment",
  "mech.clean-controls": "mechanical",
  "mech.dial-cord": "mechanical",
  "mech.battery-compartment": "mechanical",
  "test.voltages": "test",
  "test.leakage": "test",
  "test.burn-in": "test",
};

/** Seeded standard minutes per unit of each rule; the office screen overrides them. */
export const defaultMinutesPerRule: Record<RuleCode, number> = {
  "inspect.intake": 20,
  "inspect.tubes": 3,
  "inspect.transistors": 2,
  "inspect.fault-find": 30,
  "safety.isolation-bench": 10,
  "safety.discharge-filter-caps": 5,
  "safety.current-limited-power-up": 15,
  "safety.y-capacitor": 15,
  "safety.polarized-plug-fuse": 30,
  "safety.fuse": 20,
  "safety.line-cord": 20,
  "safety.selenium": 20,
  "recap.electrolytic": 10,
  "recap.paper": 6,
  "align.if": 10,
  "align.fm-detector": 20,
  "align.tracking": 30,
  "align.dial": 10,
  "mech.clean-controls": 20,
  "mech.dial-cord": 45,
  "mech.battery-compartment": 30,
  "test.voltages": 15,
  "test.leakage": 15,
  "test.burn-in": 30,
};

/** The rule a line code belongs to ("align.tracking.2" → "align.tracking"). */
export function ruleOfLineCode(code: string): RuleCode | null {
  const found = [...ruleCodes].sort((a, b) => b.length - a.length).find((r) => code === r || code.startsWith(`${r}.`));
  return found ?? null;
}
