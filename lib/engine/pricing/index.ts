export * from "./money";
export * from "./parts";
export * from "./deposit";
export * from "./price-estimate";
export * from "./account";
