export * from "./deadline";
export * from "./state";
export * from "./meaning";
export * from "./links";
