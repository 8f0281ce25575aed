// The part of fontkit 2 the reports use (the package ships no types).
declare module 'fontkit' {
  export interface Font {
    postscriptName: string;
    familyName: string;
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function create(buffer: Buffer | Uint8Array, postscriptName?: string): Font;
}
