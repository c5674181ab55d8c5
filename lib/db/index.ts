export * from "./traces";
export * from "./definitions";
export * from "./reviews";
