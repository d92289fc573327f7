export * from "./rules";
export * from "./profile";
export * from "./safety-figures";
export * from "./compute-checklist";
export * from "./cautions";
