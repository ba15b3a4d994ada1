import bwipjs from 'bwip-js/node';
import sharp from 'sharp';

// Drawn barcodes by text: a packing slip printed again (or another slip of the same return) embeds the same PNG
// without drawing it again. The PNG depends only on the text, so a cached one is the same bytes.
const CACHE_SIZE = 256;
const drawn = new Map<string, Promise<Buffer>>();

/**
 * A Code 128 barcode (ISO/IEC 15417) of `text` as an opaque greyscale PNG, with the text printed under the bars.
 * bwip-js draws on a transparent background; flattening onto white makes the PNG one pdfkit embeds as it is
 * (no alpha to split off), so the slip carries exactly these image bytes.
 */
export function code128Png(text: string): Promise<Buffer> {
  let png = drawn.get(text);
  if (png) {
    // Most recently used last: the oldest entry is the first one a full cache drops.
    drawn.delete(text);
    drawn.set(text, png);
    return png;
  }
  png = draw(text);
  drawn.set(text, png);
  png.catch(() => drawn.delete(text));
  if (drawn.size > CACHE_SIZE) drawn.delete(drawn.keys().next().value!);
  return png;
}

async function draw(text: string): Promise<Buffer> {
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
