// Embed options shared by the chamber charts. The app's Content-Security-Policy has no
// 'unsafe-eval' in production, so vega must evaluate expressions with its interpreter (ast: true)
// instead of compiling them with new Function.
import type { EmbedOptions } from "vega-embed";
import { expressionInterpreter } from "vega-interpreter";

export const EMBED_OPTIONS: EmbedOptions = {
  actions: false,
  renderer: "svg",
  ast: true,
  expr: expressionInterpreter,
  tooltip: true,
};
