export * from "./canonical-json";
export * from "./sign";
export * from "./code";
export * from "./content";
