export * from "./product";
export * from "./lumped";
export * from "./screening";
