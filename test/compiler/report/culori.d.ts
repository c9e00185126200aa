// The few functions of culori (a general-purpose colour library, devDependency) the colour
// tests use as their outside reference; culori ships no types of its own.
declare module "culori" {
  export interface Colour {
    mode: string;
    [channel: string]: number | string | undefined;
  }
  export function converter(mode: "oklab" | "oklch" | "rgb"): (colour: string | Colour) => Colour;
  export function formatHex(colour: string | Colour): string;
  export function filterDeficiencyProt(severity?: number): (colour: string | Colour) => Colour;
  export function filterDeficiencyDeuter(severity?: number): (colour: string | Colour) => Colour;
  export function filterDeficiencyTrit(severity?: number): (colour: string | Colour) => Colour;
}
