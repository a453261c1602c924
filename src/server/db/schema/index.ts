// The schema, split by domain. Each later domain adds its file here.
export * from "./enums";
export * from "./people";
export * from "./studies";
export * from "./audit";
export * from "./outbox";
export * from "./documents";
export * from "./protocol";
export * from "./budgets";
export * from "./acknowledgements";
export * from "./binder";
export * from "./subjects";
export * from "./payments";
