// fontkit (pdfkit's own font parser) ships no types; Lumenproof only parses a font once and hands it to pdfkit.
declare module 'fontkit' {
  /** A parsed font; pdfkit accepts it wherever it accepts a font file (it has `layout`). */
  export interface Font {
    readonly postscriptName: string;
    layout(text: string): unknown;
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font;
}
