export * from "./reading-keys";
export * from "./tolerances";
export * from "./judge-reading";
export * from "./required-readings";
export * from "./reading-values";
