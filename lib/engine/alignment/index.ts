export * from "./inputs";
export * from "./frequencies";
export * from "./tracking";
export * from "./tracking-points";
export * from "./minimax";
export * from "./plan";
export * from "./solve-tracking";
