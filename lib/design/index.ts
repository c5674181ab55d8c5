export * from "./calibrate";
export * from "./profile";
export * from "./vary";
export * from "./sizing";
export * from "./governing";
export * from "./ruleNotes";
export * from "./cautions";
