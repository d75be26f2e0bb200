// three.js ships its USDA reader without type declarations (@types/three covers only the
// USD loaders). This covers what the export tests of lib/groom call: the parsed layer's shape
// is left for the caller to narrow.
declare module 'three/examples/jsm/loaders/usd/USDAParser.js' {
  export class USDAParser {
    parseText(text: string): unknown;
    parseData(text: string): unknown;
  }
}
