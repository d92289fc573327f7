import { Notice } from "@/components/ui/notice";
import type { SetKind } from "@/lib/engine/checklist/profile";

// The cautions that apply to this kind of set, shown on the bench sheet before any reading is taken.
export function benchCautions({ kind, seleniumRectifier }: { kind: SetKind; seleniumRectifier?: boolean }): { id: string; text: string }[] {
  const out: { id: string; text: string }[] = [];
  const tube = kind === "tube-acdc" || kind === "tube-transformer";
  const mains = kind !== "transistor-battery";
  if (kind === "tube-acdc") {
    out.push({
      id: "isolation",
      text: "AC/DC set: the chassis is tied to one side of the mains and can be live. Do all bench work with the set on an isolation transformer. Make the final leakage hot check without the isolation transformer, plugged straight into the outlet, both ways round.",
    });
  }
  if (tube) {
    out.push({
      id: "discharge",
      text: "Filter capacitors keep their charge after switch-off. Discharge them through a resistor (never a screwdriver across the terminals) and confirm zero volts with a meter before touching the chassis.",
    });
  }
  if (mains) {
    out.push({
      id: "first-power",
      text: "First power-up of a restored set through a current-limiting lamp or a variac, watching for smoke, heat or a lamp that stays bright, so a shorted part cannot overheat or start a fire.",
    });
  } else {
    out.push({
      id: "first-power",
      text: "Power the set first from a current-limited bench supply at its rated battery voltage, not from fresh cells.",
    });
  }
  if (seleniumRectifier) {
    out.push({
      id: "selenium",
      text: "A failing selenium rectifier gives off noxious fumes: do not power the set with the old rectifier in circuit; ventilate the bench if it has overheated.",
    });
  }
  return out;
}

export function SafetyCautions({ kind, seleniumRectifier }: { kind: SetKind; seleniumRectifier?: boolean }) {
  const cautions = benchCautions({ kind, seleniumRectifier });
  return (
    <Notice tone="caution" title="Safety at the bench">
      <ul className="list-disc space-y-0.5 pl-5" aria-label="Safety cautions">
        {cautions.map((c) => (
          <li key={c.id} data-caution={c.id}>
            {c.text}
          </li>
        ))}
      </ul>
      <p className="text-xs">These are the usual workshop precautions; local electrical codes and licensed practice come first.</p>
    </Notice>
  );
}
