export * from "./exclusions";
export * from "./term";
export * from "./advise-claim";
export * from "./coverage-from-certificate";
