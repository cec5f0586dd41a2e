// Public entry of lib/cryo: the cryostat room's arithmetic as pure functions (SI units, unit in
// every name). Import from "@/lib/cryo"; the helper modules (interp, lsq, solve) stay internal.

export * from "./calibration";
export * from "./constants";
export * from "./cryogens";
export { CryoInputError } from "./errors";
export * from "./gas";
export * from "./helium";
export * from "./its90";
export * from "./magnet";
export * from "./odh";
export * from "./platinum";
export * from "./transport";
