import { z } from "../zod";
import { bandKinds, injections, plausibleBandRangeKHz, type Band, type BandKind } from "../bands/band";
import { isPlausibleIf, ifFamilyForBand, plausibleIfRangeKHz } from "../bands/if-presets";
import { parseFrequencyText } from "../bands/frequency-text";

export const setKinds = ["tube-acdc", "tube-transformer", "transistor-battery", "transistor-mains"] as const;
export type SetKind = (typeof setKinds)[number];
export const setKindSchema = z.enum(setKinds);

export const setKindLabels: Record<SetKind, string> = {
  "tube-acdc": "Tube set, AC/DC (live chassis)",
  "tube-transformer": "Tube set with mains transformer",
  "transistor-battery": "Transistor set, battery",
  "transistor-mains": "Transistor set, mains powered",
};

export const symptomFlags = ["no-sound", "hum", "weak", "intermittent", "distorted", "noisy-controls"] as const;
export type SymptomFlag = (typeof symptomFlags)[number];

export { plausibleBandRangeKHz };

// Form posts send checkboxes as "on"/"true" and leave them out when unticked; JSON sends booleans.
const formBoolean = z.preprocess((v) => {
  if (typeof v !== "string") return v;
  const s = v.trim().toLowerCase();
  if (["true", "on", "1", "yes"].includes(s)) return true;
  if (["false", "off", "0", "no", ""].includes(s)) return false;
  return v;
}, z.boolean());

// Every message names the field as the forms show it and says what is allowed; the one message of a schema
// covers all its checks (wrong type, not whole, out of range).
const kHz = (label: string) =>
  z.coerce
    .number({ error: `${label}: enter a frequency in kHz above 0.` })
    .finite()
    .positive();
const count = (label: string, max: number) =>
  z.coerce
    .number({ error: `${label}: enter a whole number from 0 to ${max}.` })
    .int()
    .min(0)
    .max(max);

export const bandSchema = z
  .object({
    kind: z.enum(bandKinds, { error: "Band: choose LW, MW, SW or FM." }),
    lowKHz: kHz("Dial low"),
    highKHz: kHz("Dial high"),
    ifKHz: kHz("IF"),
    label: z.string().trim().max(40, "Band label: keep it under 40 characters.").optional(),
    injection: z.enum(injections, { error: "LO side: choose above or below the signal." }).optional(),
    /** The service manual's own tracking points, low to high, when it gives them ("600, 1000, 1400" from a form). */
    trackingPointsKHz: z.preprocess(
      (v) => {
        if (typeof v !== "string") return v;
        if (v.trim() === "") return undefined;
        return v
          .split(/[;,]|\s(?=\d)/)
          .map((p) => p.trim())
          .filter(Boolean)
          .map((p) => parseFrequencyText(p) ?? p);
      },
      z
        .tuple([kHz("Manual tracking points"), kHz("Manual tracking points"), kHz("Manual tracking points")], {
          error: "Manual tracking points: give the manual's three points in kHz, low to high, e.g. 600, 1000, 1400.",
        })
        .optional(),
    ),
  })
  .superRefine((band, ctx) => {
    if (band.lowKHz >= band.highKHz) {
      ctx.addIssue({ code: "custom", path: ["highKHz"], message: "Dial high: must be above the low end." });
    }
    const range = plausibleBandRangeKHz[band.kind];
    if (band.lowKHz < range.min || band.lowKHz > range.max) {
      ctx.addIssue({
        code: "custom",
        path: ["lowKHz"],
        message: `Dial low: a ${band.kind} dial starts between ${range.min} and ${range.max} kHz.`,
      });
    }
    if (band.highKHz < range.min || band.highKHz > range.max) {
      ctx.addIssue({
        code: "custom",
        path: ["highKHz"],
        message: `Dial high: a ${band.kind} dial ends between ${range.min} and ${range.max} kHz.`,
      });
    }
    const family = ifFamilyForBand(band.kind);
    if (!isPlausibleIf(band.ifKHz, family)) {
      const r = plausibleIfRangeKHz[family];
      ctx.addIssue({ code: "custom", path: ["ifKHz"], message: `IF: an ${family} IF lies between ${r.min} and ${r.max} kHz.` });
    }
    band.trackingPointsKHz?.forEach((p, i) => {
      const ordered = i === 0 || p > band.trackingPointsKHz![i - 1]!;
      if (p < band.lowKHz || p > band.highKHz || !ordered) {
        ctx.addIssue({ code: "custom", path: ["trackingPointsKHz", i], message: "Manual tracking points: on the band, low to high." });
      }
    });
  });

export const setProfileSchema = z.object({
  kind: z.enum(setKinds, { error: "Kind of set: choose one of the kinds listed." }),
  bands: z.array(bandSchema).min(1, "Bands: add at least one band.").max(8, "Bands: 8 at most."),
  electrolytics: count("Electrolytic capacitors", 60),
  paperCapacitors: count("Paper capacitors", 120),
  tubes: count("Tubes", 40).optional(),
  transistors: count("Transistors", 60).optional(),
  /** IF transformers in the AM strip, or in the only strip of a single-IF set. */
  ifTransformers: count("IF transformers", 12).optional(),
  /** IF transformers in the 10.7 MHz FM strip of a set that also has an AM strip; each strip is aligned on its own. */
  ifTransformersFm: count("IF transformers, FM strip", 12).optional(),
  seleniumRectifier: formBoolean.optional(),
  lineCordWorn: formBoolean.optional(),
  dialCordBroken: formBoolean.optional(),
  batteryCorrosion: formBoolean.optional(),
  /** Mains voltage the set runs on; selects the leakage limit. */
  mainsVolts: z.coerce
    .number({ error: "Mains voltage: choose 120 V or 230 V." })
    .pipe(z.union([z.literal(120), z.literal(230)], { error: "Mains voltage: choose 120 V or 230 V." }))
    .optional(),
  /** Schematic B+ in volts, when known, so the bench reading gets a target. */
  bPlusVolts: z.coerce.number({ error: "B+ on the schematic: enter volts above 0, up to 1000." }).finite().positive().max(1000).optional(),
  symptoms: z
    .array(z.enum(symptomFlags, { error: "Symptoms: tick from the list." }))
    .max(symptomFlags.length)
    .optional(),
});

export type SetProfile = z.infer<typeof setProfileSchema>;
export type SetProfileInput = z.input<typeof setProfileSchema>;

export type ProfileBand = Band;

export function isMainsSet(kind: SetKind): boolean {
  return kind !== "transistor-battery";
}

export function isTubeSet(kind: SetKind): boolean {
  return kind === "tube-acdc" || kind === "tube-transformer";
}

/** Usual transformer counts when the profile gives none: two in an AM strip, three in an FM strip. */
export const usualIfTransformers = { AM: 2, FM: 3 } as const;

/**
 * The IF strips of a set, in band order, each with the number of transformers aligned in it. The AM strip
 * (455 kHz family) takes `ifTransformers`; the FM strip (10.7 MHz) takes `ifTransformersFm`, or
 * `ifTransformers` when it is the set's only strip. A count is never charged to two strips.
 */
export function ifStrips(
  profile: Pick<SetProfile, "ifTransformers" | "ifTransformersFm"> & {
    bands: readonly Pick<SetProfile["bands"][number], "kind" | "ifKHz">[];
  },
): { ifKHz: number; kind: BandKind; transformers: number }[] {
  const ifs = distinctIfs(profile.bands);
  const hasAm = ifs.some((i) => i.kind !== "FM");
  return ifs.map(({ ifKHz, kind }) => {
    const fm = kind === "FM";
    const given = fm ? (profile.ifTransformersFm ?? (hasAm ? undefined : profile.ifTransformers)) : profile.ifTransformers;
    return { ifKHz, kind, transformers: given ?? (fm ? usualIfTransformers.FM : usualIfTransformers.AM) };
  });
}

/** Distinct IFs in band order, each with the kind of the first band that uses it. */
export function distinctIfs(bands: readonly Pick<Band, "kind" | "ifKHz">[]): { ifKHz: number; kind: BandKind }[] {
  const seen = new Map<number, BandKind>();
  for (const b of bands) if (!seen.has(b.ifKHz)) seen.set(b.ifKHz, b.kind);
  return [...seen].map(([ifKHz, kind]) => ({ ifKHz, kind }));
}
