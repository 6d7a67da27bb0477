// Who may do what lives in lib/rules/roles.ts with the workshop's other rules; kept here for its importers.
export * from "./rules/roles";
