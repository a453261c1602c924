export * from "./stripe-amount";
export * from "./run-hash";
export * from "./states";
export * from "./reconciliation";
export * from "./remittance-csv";
