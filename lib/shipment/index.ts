export * from "./manifest";
export * from "./outcome";
export * from "./register";
export * from "./matching";
export * from "./historyProfile";
export * from "./content";
