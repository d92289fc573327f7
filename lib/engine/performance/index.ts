export * from "./units";
export * from "./judge";
export * from "./readings";
