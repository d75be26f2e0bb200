// The `bunny` package (the Stanford bunny from the Stanford 3D Scanning Repository) ships no types.
declare module 'bunny' {
  export const positions: [number, number, number][];
  export const cells: [number, number, number][];
}
