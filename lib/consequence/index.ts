export * from "./definitions";
export * from "./rates";
export * from "./integrate";
export * from "./baranyi";
export * from "./evaluate";
export * from "./cautions";
export * from "./templates";
