import { ifStrips, isMainsSet, isTubeSet, type SetProfile } from "./profile";
import { filterChargeText } from "./safety-figures";

export type Caution = { id: string; text: string };

/**
 * The usual workshop cautions for this set, shown on the bench sheet and returned with the estimate
 * tool, in the order the work meets them. Local electrical codes and licensed practice come first.
 */
export function computeCautions(
  profile: Pick<SetProfile, "kind" | "mainsVolts" | "bPlusVolts" | "seleniumRectifier" | "ifTransformers" | "ifTransformersFm"> & {
    bands: readonly Pick<SetProfile["bands"][number], "kind" | "ifKHz">[];
  },
): Caution[] {
  const out: Caution[] = [];
  const tube = isTubeSet(profile.kind);
  const mains = isMainsSet(profile.kind);
  const acdc = profile.kind === "tube-acdc";
  const transformer = mains && !acdc;
  const hasFm = ifStrips(profile).some((s) => s.kind === "FM");

  if (acdc) {
    out.push({
      id: "isolation",
      text: "AC/DC set: the chassis is tied to one side of the mains and can be live. Do all bench work with the set on an isolation transformer. Make the final leakage hot check without the isolation transformer, plugged straight into the outlet, both ways round.",
    });
    out.push({
      id: "cabinet-isolation",
      text: "Keep the live chassis isolated from the cabinet: knob set screws recessed or covered, the insulating back cover and its screws in place, insulating washers on the chassis bolts. Check each of them before the set goes home.",
    });
    out.push({
      id: "heater-string",
      text: "The heaters are a series string across the mains: a replacement tube needs the same heater current. A resistance line cord drops part of the mains for that string; a plain cord fitted in its place burns out the tubes, so the same resistance goes back inside the set.",
    });
    out.push({
      id: "antenna-coupling",
      text: "The antenna-lead coupling capacitor stands between an outside antenna or ground wire and the live chassis: it must be a Y-class part in good order.",
    });
  }
  if (tube) {
    out.push({
      id: "discharge",
      text: `Filter capacitors keep their charge after switch-off (${filterChargeText(profile)}). Discharge them through a resistor (never a screwdriver across the terminals) and confirm zero volts with a meter before touching the chassis.`,
    });
  }
  if (transformer) {
    out.push({
      id: "line-capacitors",
      text: "Mains-side capacitors: a bypass from the line to the chassis is a Y-class part or is removed; one across the line is an X-class part. A grounded three-wire cord with its earth bonded to the chassis is an option.",
    });
    out.push({
      id: "transformer-insulation",
      text: "Before the first power-up, check the mains transformer's insulation (primary to chassis and to the other windings) with an insulation tester.",
    });
  }
  if (mains) {
    out.push({
      id: "first-power",
      text: "Never power an unrestored set as received. First power-up after the safety parts and the recap, through a current-limiting lamp or a variac, watching for smoke, heat or a lamp that stays bright, so a shorted part cannot overheat or start a fire.",
    });
  } else {
    out.push({
      id: "first-power",
      text: "Power the set first from a current-limited bench supply at its rated battery voltage, not from fresh cells. Read the idle current draw and the bias voltages rather than checking transistor gain in circuit.",
    });
  }
  if (mains && profile.seleniumRectifier) {
    out.push({
      id: "selenium",
      text: "A failing selenium rectifier gives off noxious fumes: do not power the set with the old rectifier in circuit; ventilate the bench if it has overheated.",
    });
  }
  if (hasFm) {
    out.push({
      id: "afc",
      text: "Defeat the AFC while aligning the FM strip and front end, so it cannot pull the response being measured.",
    });
  }
  return out;
}
