// datapackage.json checked against the official Tabular Data Package profile (Frictionless Data,
// Data Package specification v1, JSON Schema draft-04), as shipped in the `datapackage` npm
// package's files: read from node_modules, not copied.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import Ajv from "ajv-draft-04";
import addFormats from "ajv-formats";

const require = createRequire(import.meta.url);
const profilePath = require.resolve("datapackage/lib/profiles/tabular-data-package.json");
const profile = JSON.parse(readFileSync(profilePath, "utf8")) as object;

// The profiles carry editor hints (propertyOrder, options, context) that are not JSON Schema keywords.
const ajv = new Ajv({ allErrors: true, strict: false });
addFormats(ajv);
ajv.addFormat("textarea", true); // an editor hint in the profile, not a constraint
const validate = ajv.compile(profile);

/** Where and what, for every way the descriptor breaks the profile; [] when it conforms. */
export function profileProblems(descriptor: unknown): string[] {
  if (validate(descriptor)) return [];
  return [...new Set((validate.errors ?? []).map((e) => `${e.instancePath || "/"} ${e.message ?? e.keyword}`))];
}

export { profilePath };
