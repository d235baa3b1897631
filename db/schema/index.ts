export * from "./enums";
export * from "./auth";
export * from "./audit";
export * from "./chambers";
export * from "./specimens";
export * from "./trials";
export * from "./photos";
export * from "./storage-rules";
