export * from "./allocate";
export * from "./prng";
