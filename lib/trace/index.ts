export * from "./series";
export * from "./settings";
export * from "./errors";
export * from "./importCsv";
export * from "./hash";
export * from "./values";
export * from "./importFile";
