import { Notice } from "@/components/ui/notice";
import { computeCautions, type Caution } from "@/lib/engine/checklist/cautions";

type CautionProfile = Parameters<typeof computeCautions>[0];

// The cautions that apply to this set come from the engine, shown on the bench sheet before any reading is taken.
export function benchCautions(profile: CautionProfile): Caution[] {
  return computeCautions(profile);
}

export function SafetyCautions({ profile }: { profile: CautionProfile }) {
  const cautions = benchCautions(profile);
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
