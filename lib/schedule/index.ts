export * from "./plans";
export * from "./status";
export { addCalendarDays, startOfDay, DAY_MS } from "./calendar";
