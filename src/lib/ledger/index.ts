export * from "./convert";
export * from "./statement-csv";
export * from "./line-labels";
