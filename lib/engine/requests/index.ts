export * from "./field-errors";
export * from "./alignment-request";
export * from "./estimate-request";
export * from "./dial-fit-request";
