import { setProfileSchema, type SetProfile } from "@/lib/engine/checklist/profile";

/** Sets from the demo scenario at Kestrel Lane Wireless, Port Alder. */

/** Aurelian five-tube AC/DC table set. */
export const aurelianTableSet: SetProfile = setProfileSchema.parse({
  kind: "tube-acdc",
  bands: [{ kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455, label: "Broadcast" }],
  electrolytics: 3,
  paperCapacitors: 9,
  tubes: 5,
  ifTransformers: 2,
  seleniumRectifier: false,
  lineCordWorn: true,
  dialCordBroken: false,
  mainsVolts: 120,
  symptoms: ["hum"],
});

/** Corvane seven-transistor portable. */
export const corvanePortable: SetProfile = setProfileSchema.parse({
  kind: "transistor-battery",
  bands: [{ kind: "MW", lowKHz: 530, highKHz: 1620, ifKHz: 455 }],
  electrolytics: 8,
  paperCapacitors: 0,
  transistors: 7,
  ifTransformers: 3,
  dialCordBroken: true,
  batteryCorrosion: true,
  symptoms: ["intermittent", "noisy-controls"],
});

/** Haldane console: broadcast, two shortwave bands and FM. */
export const haldaneConsole: SetProfile = setProfileSchema.parse({
  kind: "tube-transformer",
  bands: [
    { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455, label: "Broadcast" },
    { kind: "SW", lowKHz: 2300, highKHz: 7300, ifKHz: 455, label: "SW 1" },
    { kind: "SW", lowKHz: 7000, highKHz: 22000, ifKHz: 455, label: "SW 2" },
    { kind: "FM", lowKHz: 88000, highKHz: 108000, ifKHz: 10700, label: "FM" },
  ],
  electrolytics: 4,
  paperCapacitors: 22,
  tubes: 10,
  ifTransformers: 2,
  ifTransformersFm: 3,
  seleniumRectifier: true,
  lineCordWorn: true,
  dialCordBroken: true,
  bPlusVolts: 250,
  mainsVolts: 120,
  symptoms: ["weak", "noisy-controls"],
});
