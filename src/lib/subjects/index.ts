// Subjects: states, pseudonymous codes and the CSV import (pure, no I/O).
export * from "./subject-states";
export * from "./subject-code";
export * from "./csv-import";
