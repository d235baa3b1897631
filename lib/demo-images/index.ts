export * from "./specimen-face";
