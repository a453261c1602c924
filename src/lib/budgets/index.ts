export * from "./budget-input";
