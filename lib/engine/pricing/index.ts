export * from "./money";
export * from "./parts";
export * from "./deposit";
export * from "./price-estimate";
export * from "./account";
export * from "./billing-note";
export * from "./billing-rounding";
export * from "./currency-change";
