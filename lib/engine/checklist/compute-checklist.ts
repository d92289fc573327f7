import type { Band } from "../bands/band";
import { ruleOfThumbPoints } from "../alignment/tracking-points";
import type { PartCode } from "../pricing/parts";
import type { ShopPolicy } from "../shop-policy";
import { formatNumber } from "../verdicts/judge-reading";
import { bandName, listRequiredReadings } from "../verdicts/required-readings";
import { distinctIfs, isMainsSet, isTubeSet, type SetProfile } from "./profile";
import { ruleCategory, ruleCodes, type ChecklistCategory, type RuleCode } from "./rules";
import { capacitorCurrentMA, leakageNetworkVolts, peakVolts } from "./safety-figures";

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

const fmtKHz = (kHz: number) => (kHz >= 10000 ? `${formatNumber(kHz / 1000)} MHz` : `${formatNumber(kHz)} kHz`);

function trackingReason(band: Band): string {
  const [a, , c] = ruleOfThumbPoints(band);
  const side = (band.injection ?? "high") === "high" ? "above" : "below";
  switch (band.kind) {
    case "FM":
      return `Align the oscillator with its coil at ${fmtKHz(a)} and its trimmer at ${fmtKHz(c)}, then peak the RF stages; repeat until nothing changes.`;
    case "SW":
      return `Set the oscillator coil at ${fmtKHz(a)} and trimmer at ${fmtKHz(c)}, bringing the trimmer up from minimum so the oscillator lands ${side} the signal and not on the image; then peak the antenna circuit. Repeat until nothing changes.`;
    default:
      return `Set the oscillator with the coil or padder at ${fmtKHz(a)} and with the trimmer at ${fmtKHz(c)}, peaking the antenna circuit at each; repeat until nothing changes, so the dial reads true across the band.`;
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
          "Photograph and inspect the chassis, wiring, cabinet and parts before any power is applied; an unrestored set is never powered as received." +
          (transistor && !mains ? " Batteries are removed on arrival." : ""),
      }),
    "inspect.tubes": () => {
      if (tube && (profile.tubes ?? 0) > 0)
        add("inspect.tubes", {
          title: "Test tubes",
          quantity: profile.tubes,
          reason: "Test each tube for emission and shorts; replace only weak or shorted ones.",
        });
    },
    "inspect.transistors": () => {
      if (transistor && (profile.transistors ?? 0) > 0)
        add("inspect.transistors", {
          title: "Check transistors",
          quantity: profile.transistors,
          reason: "Check each transistor in circuit for leakage and gain; old germanium types can fail with internal shorts.",
        });
    },
    "inspect.fault-find": () => {
      const reported = (["no-sound", "intermittent", "distorted"] as const).filter((s) => symptoms.has(s));
      if (reported.length > 0)
        add("inspect.fault-find", {
          title: "Fault finding",
          reason: `Trace the reported fault (${reported.join(", ")}) stage by stage once the set is safe to power.`,
        });
    },
    "safety.isolation-bench": () => {
      if (acdc)
        add("safety.isolation-bench", {
          title: "Isolation-transformer bench setup",
          reason: `AC/DC set: the chassis is tied to one side of the mains and can be live. All bench work is done through an isolation transformer; the final leakage hot check is made without it. ${CODES_CAUTION}`,
        });
    },
    "safety.discharge-filter-caps": () => {
      if (tube)
        add("safety.discharge-filter-caps", {
          title: "Discharge filter capacitors",
          reason: `Filter capacitors hold a charge after switch-off (a ${volts} V supply charges them to about ${Math.round(peakVolts(volts))} V). Discharge them through a resistor and confirm zero with a meter before touching the chassis.`,
        });
    },
    "safety.current-limited-power-up": () =>
      add("safety.current-limited-power-up", {
        title: "Current-limited first power-up",
        reason: mains
          ? `First power-up through a current-limiting lamp or a variac, so a shorted part cannot overheat or start a fire. ${CODES_CAUTION}`
          : "First power-up from a current-limited bench supply at the rated battery voltage, so a shorted part cannot overheat.",
      }),
    "safety.y-capacitor": () => {
      if (acdc)
        add("safety.y-capacitor", {
          title: "Y-class line-to-chassis capacitor",
          parts: [{ code: "cap.y2", quantity: 1 }],
          reason: `AC/DC set: the line-to-chassis capacitor must be a Y-class part (Y1, or Y2 on mains up to 250 V), which is made to fail open. An old 0.05 µF bypass alone passes about ${formatNumber(capacitorCurrentMA(50, volts, hertz), 1)} mA at ${volts} V ${hertz} Hz, over the leakage limit. ${CODES_CAUTION}`,
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
          reason: `AC/DC set: fit a polarized plug with the chassis side on the wide (neutral) blade and the switch in the line side, and add a fuse, so the chassis sits at neutral and a fault opens the fuse. ${CODES_CAUTION}`,
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
          reason: `The line cord is worn: old rubber insulation cracks and exposes live conductors, so the cord is replaced. ${CODES_CAUTION}`,
        });
    },
    "safety.selenium": () => {
      if (profile.seleniumRectifier)
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
          reason:
            "Replace the electrolytic capacitors: after decades they dry out or leak, causing hum and overloading the rectifier and supply.",
        });
    },
    "recap.paper": () => {
      if (profile.paperCapacitors > 0)
        add("recap.paper", {
          title: "Replace paper capacitors",
          quantity: profile.paperCapacitors,
          parts: [{ code: "cap.film", quantity: profile.paperCapacitors }],
          reason:
            "Replace paper capacitors with film types: old paper capacitors leak and can fail short. Mica, ceramic and air-variable capacitors stay unless faulty.",
        });
    },
    "align.if": () => {
      for (const { ifKHz, kind } of distinctIfs(profile.bands)) {
        const fm = kind === "FM";
        add("align.if", {
          suffix: ifKHz,
          title: `IF alignment at ${fmtKHz(ifKHz)}`,
          quantity: profile.ifTransformers ?? (fm ? 3 : 2),
          reason: `Peak the IF transformers at ${fmtKHz(ifKHz)} with a low generator level, reducing the input as the peak nears, before any RF alignment.`,
        });
      }
    },
    "align.fm-detector": () => {
      const fmIf = profile.bands.find((b) => b.kind === "FM");
      if (fmIf)
        add("align.fm-detector", {
          title: "FM detector alignment",
          reason: `Set the ratio detector or discriminator for a symmetrical response with its zero at ${fmtKHz(fmIf.ifKHz)}.`,
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
          reason: `Check the received frequency at both dial ends (${fmtKHz(band.lowKHz)} and ${fmtKHz(band.highKHz)}) against the printed marks.`,
        }),
      );
    },
    "mech.clean-controls": () =>
      add("mech.clean-controls", {
        title: "Clean controls and switches",
        reason:
          profile.bands.length > 1
            ? "Clean and lubricate the volume and tone controls, the band switch contacts and the tuning gang bearings."
            : "Clean and lubricate the volume and tone controls and the tuning gang bearings.",
      }),
    "mech.dial-cord": () => {
      if (profile.dialCordBroken)
        add("mech.dial-cord", {
          title: "Restring dial cord",
          parts: [{ code: "cord.dial", quantity: 1 }],
          reason: "The dial cord is broken or slipping: restring it with a new cord and spring so the pointer follows the gang.",
        });
    },
    "mech.battery-compartment": () => {
      if (profile.batteryCorrosion)
        add("mech.battery-compartment", {
          title: "Battery compartment repair",
          parts: [{ code: "battery.contacts", quantity: 1 }],
          reason: "Clean out the corrosion and renew the battery contacts; residue from leaking cells keeps eating springs and wiring.",
        });
    },
    "test.voltages": () => {
      if (tube)
        add("test.voltages", {
          title: "Measure supply voltages",
          reason: "Measure B+ at the filter output and compare with the schematic figure once the set is restored.",
        });
    },
    "test.leakage": () => {
      if (mains) {
        const limit = volts === 230 ? policy.tolerances.leakageLimitMA.v230 : policy.tolerances.leakageLimitMA.v120;
        add("test.leakage", {
          title: "Leakage current test",
          reason:
            `Final hot check${acdc ? " without the isolation transformer" : ""}: from each exposed metal part to earth through 1.5 kΩ in parallel with 0.15 µF, plug both ways, switch on and off. ` +
            `At most ${formatNumber(leakageNetworkVolts(limit), 2)} V rms across the network (${formatNumber(limit)} mA) on a ${volts} V set. ${CODES_CAUTION}`,
        });
      }
    },
    "test.burn-in": () =>
      add("test.burn-in", { title: "Burn-in", reason: "Run the set for several hours under observation, then recheck the readings warm." }),
  };

  for (const rule of ruleCodes) rules[rule]();
  return lines;
}
