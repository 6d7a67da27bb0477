export * from "./users";
export * from "./workshop";
export * from "./printers";
export * from "./materials";
export * from "./assemblies";
export * from "./mail";
export * from "./ledger";
export * from "./plates";
