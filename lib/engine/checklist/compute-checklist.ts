import type { Band } from "../bands/band";
import { ruleOfThumbPoints } from "../alignment/tracking-points";
import type { PartCode } from "../pricing/parts";
import type { ShopPolicy } from "../shop-policy";
import { formatNumber } from "../verdicts/judge-reading";
import { bandName, listRequiredReadings } from "../verdicts/required-readings";
import { ifStrips, isMainsSet, isTubeSet, type SetProfile } from "./profile";
import { filterChargeText } from "./safety-figures";
import { ruleCategory, ruleCodes, type ChecklistCategory, type RuleCode } from "./rules";
import { capacitorCurrentMA, leakageNetworkVolts } from "./safety-figures";

export type ChecklistPart = { code: PartCode; quantity: number };

export type ChecklistLine = {
  code: string;
  rule: RuleCode;
  title: string;
  category: ChecklistCategory;
  /** Standard minutes per unit; the line's labour is minutes × quantity. */
  minutes: number;
  quantity: number;
  reason: string;
  readings: string[];
  parts: ChecklistPart[];
};

const CODES_CAUTION = "Follow local electrical codes and licensed practice.";

/** Where the advice speaks of images: what an RF stage does for them (textbook: one more tuned circuit). */
export const IMAGE_NOTE =
  "A set with an RF stage has one more tuned circuit ahead of the mixer, which roughly doubles the image rejection in dB; without one the image is strong on the higher bands.";

const fmtKHz = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000)} MHz` : `${formatNumber(kHz)} kHz`);

function trackingReason(band: Band): string {
  const [a, , c] = ruleOfThumbPoints(band);
  const side = (band.injection ?? "high") === "high" ? "above" : "below";
  switch (band.kind) {
    case "FM":
      return `With the AFC defeated (switched off or its line grounded) so it cannot pull the oscillator, align the oscillator with its coil at ${fmtKHz(a)} and its trimmer at ${fmtKHz(c)}, then peak the RF stages; repeat until nothing changes.`;
    case "SW":
      return `Set the oscillator coil at ${fmtKHz(a)} and trimmer at ${fmtKHz(c)}, bringing the trimmer up from minimum so the oscillator lands ${side} the signal and not on the image; then peak the antenna circuit. Repeat until nothing changes. ${IMAGE_NOTE}`;
    default:
      return `Set the oscillator with the coil or padder at ${fmtKHz(a)}, rocking the gang back and forth through the signal while adjusting, then the trimmers at ${fmtKHz(c)}, peaking the antenna circuit at each; repeat until nothing changes and finish on the high-end trimmer, so the dial reads true across the band.`;
  }
}

/**
 * Checklist lines for a set profile. Deterministic: lines come out in rule order, per-IF lines in the
 * order the IFs first appear, per-band lines in band order.
 */
export function computeChecklist(profile: SetProfile, policy: Pick<ShopPolicy, "minutesPerRule" | "tolerances">): ChecklistLine[] {
  const readings = listRequiredReadings(profile, policy.tolerances);
  const readingsFor = (lineCode: string) => readings.filter((r) => r.lineCode === lineCode).map((r) => r.key);
  const mains = isMainsSet(profile.kind);
  const tube = isTubeSet(profile.kind);
  const acdc = profile.kind === "tube-acdc";
  const transistor = !tube;
  const volts = profile.mainsVolts ?? 120;
  const hertz = volts === 230 ? 50 : 60;
  const transformer = mains && !acdc;
  const symptoms = new Set(profile.symptoms ?? []);
  const lines: ChecklistLine[] = [];

  const add = (
    rule: RuleCode,
    fields: { suffix?: string | number; title: string; reason: string; quantity?: number; parts?: ChecklistPart[] },
  ) => {
    const code = fields.suffix === undefined ? rule : `${rule}.${fields.suffix}`;
    lines.push({
      code,
      rule,
      title: fields.title,
      category: ruleCategory[rule],
      minutes: policy.minutesPerRule[rule],
      quantity: fields.quantity ?? 1,
      reason: fields.reason,
      readings: readingsFor(code),
      parts: fields.parts ?? [],
    });
  };

  const rules: Record<RuleCode, () => void> = {
    "inspect.intake": () =>
      add("inspect.intake", {
        title: "Intake inspection",
        reason:
          "First, before anything else: photograph and inspect the chassis, wiring, cabinet and parts before any power is applied, so what was found is on record and nothing dangerous is missed; an unrestored set is never powered as received." +
          (transistor && !mains ? " Batteries are removed on arrival." : ""),
      }),
    "inspect.tubes": () => {
      if (tube && (profile.tubes ?? 0) > 0)
        add("inspect.tubes", {
          title: "Test tubes",
          quantity: profile.tubes,
          reason: acdc
            ? "Test each tube for emission and shorts on a tester, out of the set; replace only weak or shorted ones. The heaters of an AC/DC set are a series string across the mains: one open heater leaves every tube dark, and a replacement must have the same heater current."
            : "Test each tube for emission and shorts on a tester, out of the set; replace only weak or shorted ones.",
        });
    },
    "inspect.transistors": () => {
      if (transistor && (profile.transistors ?? 0) > 0)
        add("inspect.transistors", {
          title: mains ? "Check transistors" : "Check current draw and bias",
          quantity: profile.transistors,
          reason: mains
            ? "After the first power-up: check each transistor stage by its bias voltages against the schematic, and suspects out of circuit for leakage and gain; old germanium types can fail with internal shorts."
            : "After the first power-up from the limited supply: read the idle current draw against the schematic figure, then the bias voltages at each stage; these find a leaky or shorted transistor without in-circuit gain checks, which the surrounding parts make misleading. Old germanium types can fail with internal shorts.",
        });
    },
    "inspect.fault-find": () => {
      const reported = (["no-sound", "intermittent", "distorted"] as const).filter((s) => symptoms.has(s));
      if (reported.length > 0)
        add("inspect.fault-find", {
          title: "Fault finding",
          reason: `After the safety work, the recap and a first power-up through a limiter: trace the reported fault (${reported.map((s) => s.replace("-", " ")).join(", ")}) stage by stage, so the fault found is the set's own and not an old part's.`,
        });
    },
    "safety.isolation-bench": () => {
      if (acdc)
        add("safety.isolation-bench", {
          title: "Isolation-transformer bench setup",
          reason: `AC/DC set: the chassis is tied to one side of the mains and can be live. Set up before any work on the chassis: all bench work is done through an isolation transformer; the final leakage hot check is made without it. ${CODES_CAUTION}`,
        });
    },
    "safety.discharge-filter-caps": () => {
      if (tube)
        add("safety.discharge-filter-caps", {
          title: "Discharge filter capacitors",
          reason: `Before touching the chassis: filter capacitors hold a charge after switch-off (${filterChargeText(profile)}). Discharge them through a resistor and confirm zero with a meter.`,
        });
    },
    "safety.current-limited-power-up": () =>
      add("safety.current-limited-power-up", {
        title: "Current-limited first power-up",
        reason: mains
          ? `Only after the safety parts, the cord and the recap, since an unrestored set is never powered as received${transformer ? ", and after an insulation check of the mains transformer (primary to chassis and to the other windings) so a breakdown is found before it carries current" : ""}: first power-up through a current-limiting lamp or a variac, so a shorted part cannot overheat or start a fire. ${CODES_CAUTION}`
          : "Only after the recap and the battery compartment: first power-up from a current-limited bench supply at the rated battery voltage, not from fresh cells, so a shorted part cannot overheat.",
      }),
    "safety.y-capacitor": () => {
      if (acdc)
        add("safety.y-capacitor", {
          title: "Y-class line-to-chassis capacitor",
          parts: [{ code: "cap.y2", quantity: 1 }],
          reason: `AC/DC set: the line-to-chassis capacitor must be a Y-class part (Y1, or Y2 on mains up to 250 V), which is made to fail open. An old 0.05 µF bypass alone passes about ${formatNumber(capacitorCurrentMA(50, volts, hertz), 1)} mA at ${volts} V ${hertz} Hz, over the leakage limit. The antenna-lead coupling capacitor (between the antenna or ground terminal and the live chassis) is a Y-class part too, so a touched antenna wire cannot carry mains. Done with the other safety parts, before power is applied. ${CODES_CAUTION}`,
        });
      else if (transformer)
        add("safety.y-capacitor", {
          title: "Line bypass capacitors",
          parts: [{ code: "cap.y2", quantity: 1 }],
          reason: `Transformer set: a bypass from either mains lead to the chassis is replaced with a Y-class part (Y1, or Y2 on mains up to 250 V), made to fail open, or removed; a capacitor across the line is replaced with an X-class part. Done with the other safety parts, before power is applied. ${CODES_CAUTION}`,
        });
    },
    "safety.polarized-plug-fuse": () => {
      if (acdc)
        add("safety.polarized-plug-fuse", {
          title: "Polarized plug and fuse",
          parts: [
            { code: "plug.polarized", quantity: 1 },
            { code: "fuse.holder", quantity: 1 },
            { code: "fuse", quantity: 1 },
          ],
          reason: `AC/DC set: fit a polarized plug with the chassis side on the wide (neutral) blade and the switch in the line side, and add a fuse, so the chassis sits at neutral and a fault opens the fuse. Keep the chassis isolated from the cabinet: knob set screws recessed or covered, the insulating back cover fitted, insulating washers on the chassis bolts. ${CODES_CAUTION}`,
        });
    },
    "safety.fuse": () => {
      if (mains && !acdc)
        add("safety.fuse", {
          title: "Add a fuse",
          parts: [
            { code: "fuse.holder", quantity: 1 },
            { code: "fuse", quantity: 1 },
          ],
          reason: `Add a fuse in the line side so a fault inside the set opens the fuse instead of overheating the transformer or wiring. ${CODES_CAUTION}`,
        });
    },
    "safety.line-cord": () => {
      if (mains && profile.lineCordWorn)
        add("safety.line-cord", {
          title: "Replace line cord",
          parts: [{ code: "cord.line", quantity: 1 }],
          reason:
            `The line cord is worn: old rubber insulation cracks and exposes live conductors, so the cord is replaced before power is applied.` +
            (acdc
              ? " If the old cord is a resistance cord (a third, warm-running wire dropping the heater voltage), put the same resistance back as a dropping resistor inside the set: a plain cord in its place over-runs the series heater string and burns out the tubes."
              : transformer
                ? " A grounded three-wire cord, with its earth bonded to the chassis, is an option on a transformer set."
                : "") +
            ` ${CODES_CAUTION}`,
        });
    },
    "safety.selenium": () => {
      // A battery set has no rectifier.
      if (mains && profile.seleniumRectifier)
        add("safety.selenium", {
          title: "Replace selenium rectifier",
          parts: [
            { code: "diode.silicon", quantity: 1 },
            { code: "resistor.series", quantity: 1 },
          ],
          reason:
            "Selenium rectifiers age, run hot and give off noxious fumes when they fail: replace with a silicon diode plus a series resistor that keeps the B+ near its original value.",
        });
    },
    "recap.electrolytic": () => {
      if (profile.electrolytics > 0)
        add("recap.electrolytic", {
          title: "Replace electrolytic capacitors",
          quantity: profile.electrolytics,
          parts: [{ code: "cap.electrolytic", quantity: profile.electrolytics }],
          reason: mains
            ? "Replace the electrolytic capacitors before the first power-up: after decades they dry out or leak, causing hum and overloading the rectifier and supply."
            : "Replace the electrolytic capacitors before the first power-up: after decades they dry out or leak, causing motorboating, weak audio and a heavy drain on the battery.",
        });
    },
    "recap.paper": () => {
      if (profile.paperCapacitors > 0)
        add("recap.paper", {
          title: "Replace paper capacitors",
          quantity: profile.paperCapacitors,
          parts: [{ code: "cap.film", quantity: profile.paperCapacitors }],
          reason:
            "Replace paper capacitors with film types before the first power-up: old paper capacitors leak and can fail short, upsetting bias and loading the supply. Mica, ceramic and air-variable capacitors stay unless faulty.",
        });
    },
    "align.if": () => {
      for (const { ifKHz, kind, transformers } of ifStrips(profile)) {
        const fm = kind === "FM";
        add("align.if", {
          suffix: ifKHz,
          title: `IF alignment at ${fmtKHz(ifKHz)}`,
          quantity: transformers,
          reason:
            `Once the set runs and the dial cord is right: peak the ${transformers} IF transformer${transformers === 1 ? "" : "s"} of the ${fmtKHz(ifKHz)} strip with a low generator level, reducing the input as the peak nears, before any RF alignment.` +
            (fm ? " Defeat the AFC while aligning, so it does not pull the response it is meant to measure." : ""),
        });
      }
    },
    "align.fm-detector": () => {
      const fmIf = profile.bands.find((b) => b.kind === "FM");
      if (fmIf)
        add("align.fm-detector", {
          title: "FM detector alignment",
          reason: `With the AFC defeated, set the ratio detector or discriminator for a symmetrical response with its zero at ${fmtKHz(fmIf.ifKHz)}.`,
        });
    },
    "align.tracking": () => {
      profile.bands.forEach((band, i) =>
        add("align.tracking", { suffix: i, title: `Tracking alignment, ${bandName(band, i)}`, reason: trackingReason(band) }),
      );
    },
    "align.dial": () => {
      profile.bands.forEach((band, i) =>
        add("align.dial", {
          suffix: i,
          title: `Band-edge check, ${bandName(band, i)}`,
          reason: `After tracking, check the received frequency at both dial ends (${fmtKHz(band.lowKHz)} and ${fmtKHz(band.highKHz)}) against the printed marks.`,
        }),
      );
    },
    "mech.clean-controls": () =>
      add("mech.clean-controls", {
        title: "Clean controls and switches",
        reason:
          profile.bands.length > 1
            ? "Before alignment, since dirty contacts shift it: clean and lubricate the volume and tone controls, the band switch contacts and the tuning gang bearings."
            : "Before alignment, since a sticky gang spoils it: clean and lubricate the volume and tone controls and the tuning gang bearings.",
      }),
    "mech.dial-cord": () => {
      if (profile.dialCordBroken)
        add("mech.dial-cord", {
          title: "Restring dial cord",
          parts: [{ code: "cord.dial", quantity: 1 }],
          reason:
            "The dial cord is broken or slipping: restring it with a new cord and spring before alignment, so the pointer follows the gang and the dial can be calibrated.",
        });
    },
    "mech.battery-compartment": () => {
      if (profile.batteryCorrosion)
        add("mech.battery-compartment", {
          title: "Battery compartment repair",
          parts: [{ code: "battery.contacts", quantity: 1 }],
          reason:
            "Before the first power-up: clean out the corrosion and renew the battery contacts; residue from leaking cells keeps eating springs and wiring and makes the supply intermittent.",
        });
    },
    "test.voltages": () => {
      if (tube)
        add("test.voltages", {
          title: "Measure supply voltages",
          reason:
            "Once the set is restored and aligned: measure B+ at the filter output and compare with the schematic figure, noting the mains voltage at the time.",
        });
    },
    "test.leakage": () => {
      if (mains) {
        const limit = volts === 230 ? policy.tolerances.leakageLimitMA.v230 : policy.tolerances.leakageLimitMA.v120;
        add("test.leakage", {
          title: "Leakage current test",
          reason:
            `Final hot check after all the work, since any part changed can change leakage${acdc ? ", made without the isolation transformer" : ""}: from each exposed metal part${acdc ? " (knob set screws, the back-cover screws, any metal trim)" : ""} to earth through 1.5 kΩ in parallel with 0.15 µF, plug both ways, switch on and off. ` +
            `At most ${formatNumber(leakageNetworkVolts(limit), 2)} V rms across the network (${formatNumber(limit)} mA) on a ${volts} V set. ${CODES_CAUTION}`,
        });
      }
    },
    "test.burn-in": () =>
      add("test.burn-in", {
        title: "Burn-in",
        reason:
          "Last: run the set for several hours under observation, then recheck the readings warm, so a part that fails when hot shows up at the bench and not at home.",
      }),
  };

  for (const rule of ruleCodes) rules[rule]();
  return lines;
}
