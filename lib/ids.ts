// Row ids are UUIDs. Ids from URLs are checked before they reach SQL, so a malformed one is simply
// "not found" instead of a database error.
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const isUuid = (v: unknown): v is string => typeof v === "string" && UUID.test(v);
