// three.js ships no types for its USDA parser; this covers what the tests call.
declare module 'three/examples/jsm/loaders/usd/USDAParser.js' {
  export class USDAParser {
    parseText(text: string): Record<string, unknown>;
    parseData(text: string): { specsByPath: Record<string, { specType: number; fields: Record<string, unknown> }> };
  }
}
