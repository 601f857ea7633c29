export * from "./accounts";
export * from "./graphs";
export * from "./runs";
export * from "./audit";
export { ROLES } from "./columns";
