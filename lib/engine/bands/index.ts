export * from "./band";
export * from "./rasters";
export * from "./presets";
export * from "./if-presets";
export * from "./metre-band";
export * from "./frequency-text";
