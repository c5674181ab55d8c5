export * from "./monitor";
export * from "./forecast";
export * from "./stale";
export * from "./alerts";
export * from "./body";
export * from "./words";
export * from "./schemas";
