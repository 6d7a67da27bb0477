export * from "./users";
export * from "./workshop";
