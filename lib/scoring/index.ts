export * from "./grades";
export * from "./geometry";
export * from "./rust-estimate";
