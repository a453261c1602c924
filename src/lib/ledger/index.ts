export * from "./convert";
export * from "./statement-csv";
export * from "./line-labels";
export * from "./build-snapshot";
