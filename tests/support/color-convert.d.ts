// color-convert ships no types; only the conversion the colour tests compare against.
declare module "color-convert" {
  const convert: { rgb: { lab: { raw(rgb: readonly [number, number, number]): [number, number, number] } } };
  export default convert;
}
