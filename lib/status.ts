// Part and item status rules live in lib/rules/status.ts with the workshop's other rules; kept here for its importers.
export * from "./rules/status";
