import { z } from "@/lib/engine/zod";

// The words a person reads when a field is refused. Schemas give their own message wherever a field can go
// wrong in a way people meet ("Paper capacitors: enter a whole number from 0 to 120."); this error map is the
// fallback for any check without one, so no message ever reaches a person in the validator's own phrasing
// ("Too small: expected number to be >0"). Every message starts with the field's name as the form shows it,
// then says what is allowed.

/** The name a person knows each field by, keyed by the field's last path segment. */
export const FIELD_LABEL: Record<string, string> = {
  maker: "Maker",
  model: "Model",
  year: "Year",
  serial: "Serial number",
  kind: "Kind of set",
  bands: "Bands",
  label: "Band label",
  lowKHz: "Dial low",
  highKHz: "Dial high",
  ifKHz: "IF",
  injection: "LO side",
  trackingPointsKHz: "Manual tracking points",
  electrolytics: "Electrolytic capacitors",
  paperCapacitors: "Paper capacitors",
  tubes: "Tubes",
  transistors: "Transistors",
  ifTransformers: "IF transformers",
  ifTransformersFm: "IF transformers, FM strip",
  mainsVolts: "Mains voltage",
  bPlusVolts: "B+ on the schematic",
  symptoms: "Symptoms",
  title: "Title",
  code: "Code",
  category: "Category",
  minutes: "Minutes",
  quantity: "Quantity",
  unitCost: "Cost",
  markupPercent: "Markup",
  reason: "Reason",
  value: "Reading",
  note: "Note",
  description: "What happens",
  symptomCategory: "What the set does",
  statements: "What happened since the return",
  photos: "Photos",
  decision: "Decision",
  findings: "Findings",
  name: "Name",
  phone: "Phone",
  email: "E-mail",
  amount: "Amount",
};

/** "paperCapacitors" → "Paper capacitors", for a field the table does not name. */
function humanise(key: string): string {
  const words = key
    .replace(/([a-z])([A-Z])/g, "$1 $2")
    .replace(/[-_]/g, " ")
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** The field's name from an issue path: the last named segment ("bands.0.lowKHz" → "Dial low"). */
export function fieldLabel(path: readonly PropertyKey[] | undefined): string {
  const key = [...(path ?? [])].reverse().find((p): p is string => typeof p === "string");
  if (!key) return "This field";
  return FIELD_LABEL[key] ?? humanise(key);
}

type Issue = {
  code?: string;
  path?: PropertyKey[];
  expected?: string;
  origin?: string;
  minimum?: number | bigint;
  maximum?: number | bigint;
  inclusive?: boolean;
  format?: string;
  input?: unknown;
};

const n = (v: number | bigint | undefined) => (typeof v === "bigint" ? v.toString() : String(v));

/** What is allowed, in words, for one issue (without the field's name). */
export function allowedWords(iss: Issue): string {
  const origin = iss.origin;
  switch (iss.code) {
    case "invalid_type":
      if (iss.expected === "number" || iss.expected === "int") return "enter a number.";
      if (iss.expected === "boolean") return "tick or untick it.";
      if (iss.expected === "array") return "choose from the list.";
      if (iss.input === undefined || iss.input === null) return "this is needed.";
      return "enter it as text.";
    case "too_small":
      if (origin === "string") return Number(iss.minimum) <= 1 ? "this cannot be empty." : `write at least ${n(iss.minimum)} characters.`;
      if (origin === "array" || origin === "set") return `choose at least ${n(iss.minimum)}.`;
      if (iss.inclusive === false) return `enter a number above ${n(iss.minimum)}.`;
      return `enter a number of at least ${n(iss.minimum)}.`;
    case "too_big":
      if (origin === "string") return `keep it under ${n(iss.maximum)} characters.`;
      if (origin === "array" || origin === "set") return `${n(iss.maximum)} at most.`;
      if (iss.inclusive === false) return `enter a number below ${n(iss.maximum)}.`;
      return `enter a number of at most ${n(iss.maximum)}.`;
    case "not_multiple_of":
      return "enter a whole number.";
    case "invalid_value":
    case "invalid_union":
      return "choose one of the options offered.";
    case "invalid_format":
      if (iss.format === "email") return "enter an e-mail address such as name@example.com.";
      if (iss.format === "uuid" || iss.format === "guid") return "this reference is not one we know; reload the page.";
      return "this is not written in a form we accept.";
    case "unrecognized_keys":
      return "this form sent a field it does not have; reload the page.";
    default:
      return "check this value.";
  }
}

/** The fallback message: the field's name, then what is allowed. */
export function fieldWordsError(iss: Issue): string {
  return `${fieldLabel(iss.path)}: ${allowedWords(iss)}`;
}

// One place for every zod parse in this process (browser or server): any check without its own message speaks
// these words instead of the validator's defaults.
z.config({ customError: (iss) => fieldWordsError(iss as Issue) });

/** "Paper capacitors: enter a whole number from 0 to 120." */
export function wholeNumberWords(label: string, min: number, max: number): string {
  return `${label}: enter a whole number from ${min} to ${max}.`;
}
