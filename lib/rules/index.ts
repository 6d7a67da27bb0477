/**
 * The workshop's rules in one framework-free module: fit of a part on a printer (with the bed
 * margin), material keys, the bed-contact and overhang rules, mesh health (what may be sent),
 * stable orientations, part statuses and roles. Every caller (part page, quote, orientation,
 * split, queue, planner) asks here.
 */
export * from "./fit";
export * from "./materials";
export * from "./surface";
export * from "./status";
export * from "./roles";
export * from "./mesh-health";
export * from "./stability";
export * from "./orientation-names";
export * from "./split";
