// Minimal types for the parts of d3-scale-chromatic (dev dependency) the tests use.
declare module 'd3-scale-chromatic' {
  export function interpolateViridis(t: number): string;
  export function interpolateRdBu(t: number): string;
}
