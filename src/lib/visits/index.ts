// Visits: pure calendar computations (no I/O). See DESIGN.md capability 4.
export * from "./calendar-date";
export * from "./subject-calendar";
export * from "./deviations";
export * from "./ical";
