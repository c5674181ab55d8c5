export * from "./definitions";
export * from "./geometry";
export * from "./resistances";
export * from "./lumped";
export * from "./screening";
export * from "./predict";
export * from "./resolve";
export { compositionMaterial, constantMaterial, type Material } from "./properties/material";
export * from "./stepper";
