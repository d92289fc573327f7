export * from "./analyse";
