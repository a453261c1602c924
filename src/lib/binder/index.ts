export * from "./readiness";
export * from "./dates";
export * from "./matrix";
