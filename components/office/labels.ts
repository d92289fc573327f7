import type { ChecklistCategory, RuleCode } from "@/lib/engine/checklist/rules";

// Words for the office screens; the checklist's own line titles come from the engine.
export const RULE_LABEL: Record<RuleCode, { title: string; per?: string }> = {
  "inspect.intake": { title: "Intake inspection" },
  "inspect.tubes": { title: "Test tubes", per: "per tube" },
  "inspect.transistors": { title: "Check transistors", per: "per transistor" },
  "inspect.fault-find": { title: "Fault finding" },
  "safety.isolation-bench": { title: "Isolation-transformer bench setup" },
  "safety.discharge-filter-caps": { title: "Discharge filter capacitors" },
  "safety.current-limited-power-up": { title: "Current-limited first power-up" },
  "safety.y-capacitor": { title: "Y-class line-to-chassis capacitor" },
  "safety.polarized-plug-fuse": { title: "Polarized plug and fuse" },
  "safety.fuse": { title: "Add a fuse" },
  "safety.line-cord": { title: "Replace line cord" },
  "safety.selenium": { title: "Replace selenium rectifier" },
  "recap.electrolytic": { title: "Replace electrolytic capacitors", per: "per capacitor" },
  "recap.paper": { title: "Replace paper capacitors", per: "per capacitor" },
  "align.if": { title: "IF alignment", per: "per IF" },
  "align.fm-detector": { title: "FM detector alignment" },
  "align.tracking": { title: "Tracking alignment", per: "per band" },
  "align.dial": { title: "Band-edge check", per: "per band" },
  "mech.clean-controls": { title: "Clean controls and switches" },
  "mech.dial-cord": { title: "Restring dial cord" },
  "mech.battery-compartment": { title: "Battery compartment repair" },
  "test.voltages": { title: "Measure supply voltages" },
  "test.leakage": { title: "Leakage current test" },
  "test.burn-in": { title: "Burn-in" },
};

export const CATEGORY_LABEL: Record<ChecklistCategory, string> = {
  inspection: "Inspection",
  safety: "Safety work",
  recap: "Recapping",
  alignment: "Alignment",
  mechanical: "Mechanical",
  test: "Tests and burn-in",
};

export const BAND_KIND_LABEL = { LW: "Long wave", MW: "Medium wave", SW: "Short wave", FM: "FM" } as const;

export const PAYMENT_STATUS_LABEL = {
  open: { text: "Awaiting payment", icon: "…" },
  processing: { text: "Processing", icon: "◔" },
  paid: { text: "Received", icon: "✓" },
  failed: { text: "Failed", icon: "✕" },
  expired: { text: "Expired", icon: "⌛" },
  duplicate: { text: "Duplicate charge — owed back", icon: "⧉" },
  voided: { text: "Voided — entered by mistake", icon: "⊘" },
} as const;

export const METHOD_LABEL = { card: "Card (online)", cash: "Cash", cheque: "Cheque" } as const;

export const REFUND_STATUS_LABEL = {
  requested: { text: "Waiting for the processor", icon: "◔" },
  pending: { text: "Pending — outcome not known yet", icon: "⧗" },
  succeeded: { text: "Refunded", icon: "✓" },
  failed: { text: "Failed — nothing refunded", icon: "✕" },
} as const;

export const PURPOSE_LABEL = { deposit: "Deposit", balance: "Balance" } as const;
