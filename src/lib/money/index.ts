export * from "./currencies";
export * from "./rounding";
export * from "./allocate";
export * from "./parse";
export * from "./format";
export * from "./schema";
