/** The job state machine and money rules: pure data and functions, no database, no framework. */
export * from "./states";
export * from "./state-machine";
export * from "./fees";
export * from "./dispute-window";
