import bwipjs from 'bwip-js/node';
import sharp from 'sharp';

/**
 * A Code 128 barcode (ISO/IEC 15417) of `text` as an opaque greyscale PNG, with the text printed under the bars.
 * bwip-js draws on a transparent background; flattening onto white makes the PNG one pdfkit embeds as it is
 * (no alpha to split off), so the slip carries exactly these image bytes.
 */
export async function code128Png(text: string): Promise<Buffer> {
  const png = await bwipjs.toBuffer({ bcid: 'code128', text, scale: 3, height: 12, includetext: true });
  // ISO/IEC 15417 asks for a quiet zone of at least 10 modules on each side (a module is `scale` pixels here).
  const quiet = 10 * 3;
  return sharp(png)
    .flatten({ background: '#ffffff' })
    .extend({ left: quiet, right: quiet, top: 6, bottom: 6, background: '#ffffff' })
    .toColourspace('b-w')
    .png({ compressionLevel: 9 })
    .toBuffer();
}
