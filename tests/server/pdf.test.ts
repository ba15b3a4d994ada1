import {
  BarcodeFormat,
  BinaryBitmap,
  DecodeHintType,
  HybridBinarizer,
  MultiFormatReader,
  RGBLuminanceSource,
} from '@zxing/library';
import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';

import {
  sampleApprovalLetter,
  sampleCreditMemo,
  sampleCreditReversal,
  sampleDenialLetter,
  samplePackingSlip,
  sampleRepairLetter,
} from '../../scripts/lib/document-samples';
import { DENIAL_CODES } from '../../shared/claims/actions.schema';
import { code128Png } from '../../server/lib/pdf/barcode';
import { memoTotal, renderCreditMemo } from '../../server/lib/pdf/credit-memo';
import { renderDeterminationLetter } from '../../server/lib/pdf/determination-letter';
import { paperFor } from '../../server/lib/pdf/document';
import { sha256Hex } from '../../server/lib/pdf/hash';
import { loadLayout } from '../../server/lib/pdf/layout';
import { renderPackingSlip } from '../../server/lib/pdf/packing-slip';

// The documents are checked through what a reader gets: the text pdf-parse extracts from the PDF (with
// whitespace folded, since table cells wrap), the rendered barcode, and the bytes themselves.

async function textOf(pdf: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const { text } = await parser.getText();
    return text.replace(/\s+/g, ' ');
  } finally {
    await parser.destroy();
  }
}

const fold = (s: string) => s.replace(/\s+/g, ' ');
const trailerId = (pdf: Buffer) => /\/ID \[<([0-9a-f]+)>/.exec(pdf.toString('latin1'))?.[1];
const pageCount = (pdf: Buffer) => pdf.toString('latin1').match(/\/Type \/Page\b/g)?.length ?? 0;

/** Decodes a Code 128 barcode from an image (any format sharp reads) with ZXing. */
async function decodeBarcode(image: Buffer | Uint8Array): Promise<string> {
  const { data, info } = await sharp(image).greyscale().raw().toBuffer({ resolveWithObject: true });
  const luminances = new Uint8ClampedArray(info.width * info.height);
  for (let i = 0; i < luminances.length; i++) luminances[i] = data[i * info.channels];
  const source = new RGBLuminanceSource(luminances, info.width, info.height);
  const hints = new Map<DecodeHintType, unknown>([
    [DecodeHintType.POSSIBLE_FORMATS, [BarcodeFormat.CODE_128]],
    [DecodeHintType.TRY_HARDER, true],
  ]);
  const reader = new MultiFormatReader();
  const result = reader.decode(new BinaryBitmap(new HybridBinarizer(source)), hints);
  expect(result.getBarcodeFormat()).toBe(BarcodeFormat.CODE_128);
  return result.getText();
}

/** The image data of a PNG: its IDAT chunks, concatenated (what a PDF embeds for an opaque PNG). */
function idatOf(png: Buffer): Buffer {
  const parts: Buffer[] = [];
  for (let o = 8; o < png.length;) {
    const length = png.readUInt32BE(o);
    if (png.toString('latin1', o + 4, o + 8) === 'IDAT') parts.push(png.subarray(o + 8, o + 8 + length));
    o += 12 + length;
  }
  return Buffer.concat(parts);
}

describe('determination letter', () => {
  it('holds the claim number, the parties, the decision and every finding with its reference', async () => {
    const text = await textOf(await renderDeterminationLetter(sampleApprovalLetter));
    const d = sampleApprovalLetter;
    expect(text).toContain(d.claimNumber);
    expect(text).toContain(d.contractor.name);
    expect(text).toContain(d.manufacturer.name);
    expect(text).toContain(d.product.model);
    expect(text).toContain(d.site.name);
    expect(text).toContain('Approved');
    expect(text).toContain('Credit to the contractor');
    expect(text).toContain('$256.01 USD');
    expect(text).toContain('Rhea Okafor');
    // The decision date 2025-06-12, written out for the default en-US recipient (CLDR en long "MMMM d, y").
    expect(text).toContain('June 12, 2025');
    expect(text).toContain('likely covered');
    for (const f of d.evaluation.findings) {
      expect(text).toContain(fold(f.message));
      if (f.reference) expect(text).toContain(fold(f.reference));
    }
    // Severity as words, not codes.
    expect(text).toContain('Failed');
    expect(text).toContain('Passed');
    expect(text).not.toContain('Before any repair in the field');
  });

  it('a repair allowance carries the listing and code caution; a partial approval says so', async () => {
    const text = await textOf(await renderDeterminationLetter(sampleRepairLetter));
    expect(text).toContain('Partly approved');
    expect(text).toContain('Field-repair allowance');
    expect(text).toContain('1 of 2');
    expect(text).toContain('Before any repair in the field');
    expect(text).toContain('can void its safety listing and the rest of its warranty');
    expect(text).toContain('local electrical codes');
    expect(text).toContain('licensed, qualified electricians');
    expect(text).toContain(fold(sampleRepairLetter.decision.overrideReason!));
  });

  it('a denial lists its reasons and note, and carries no repair caution', async () => {
    const text = await textOf(await renderDeterminationLetter(sampleDenialLetter));
    expect(text).toContain('Denied');
    expect(text).toContain('likely excluded');
    expect(text).toContain('installed in a location wetter than its rating');
    expect(text).toContain('Water, debris or insects got into the unit');
    expect(text).toContain(fold(sampleDenialLetter.decision.note!));
    expect(text).not.toContain('Before any repair in the field');
    expect(text).not.toContain('safety listing');
    expect(text).not.toContain('Resolution');
  });

  it('the template words every denial code, verdict and severity', () => {
    const layout = loadLayout('determination-letter');
    for (const code of DENIAL_CODES) expect(layout.word('denialCode', code)).toMatch(/\S/);
    for (const v of ['covered', 'excluded', 'review']) expect(layout.word('verdict', v)).toMatch(/\S/);
    for (const s of ['pass', 'info', 'warn', 'fail']) expect(layout.word('severity', s)).toMatch(/\S/);
  });

  it('numbers its pages "Page n of m" when the findings run long', async () => {
    const many = Array.from({ length: 60 }, (_, i) => ({
      code: `electrical.sample_${i}`,
      severity: 'warn' as const,
      message: `Sample finding number ${i + 1} with enough words to take a line of the table.`,
      reference: 'LED application-note practice',
    }));
    const pdf = await renderDeterminationLetter({
      ...sampleApprovalLetter,
      evaluation: { ...sampleApprovalLetter.evaluation, findings: many },
    });
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThan(1);
    const text = await textOf(pdf);
    for (let n = 1; n <= pages; n++) expect(text).toContain(`Page ${n} of ${pages}`);
    expect(text).toContain('Sample finding number 60');
  });
});

describe("dates in the recipient's locale", () => {
  it('prints the same calendar day, written the way the recipient reads it', async () => {
    const us = await textOf(await renderDeterminationLetter(sampleApprovalLetter));
    const gb = await textOf(await renderDeterminationLetter({ ...sampleApprovalLetter, locale: 'en-GB' }));
    // CLDR long date patterns: en "MMMM d, y", en-GB "d MMMM y"
    expect(us).toContain('June 12, 2025');
    expect(gb).toContain('12 June 2025');
    expect(gb).not.toContain('June 12, 2025');
    const slip = await textOf(await renderPackingSlip({ ...samplePackingSlip, locale: 'fr-CA' }));
    expect(samplePackingSlip.issuedOn).toBe('2025-06-03');
    expect(slip).toContain('3 juin 2025'); // CLDR fr long "d MMMM y"
  });
});

describe('the same input gives the same bytes', () => {
  it('for each document, rendered twice', async () => {
    const renders: [string, () => Promise<Buffer>][] = [
      ['letter', () => renderDeterminationLetter(sampleRepairLetter)],
      ['slip', () => renderPackingSlip(samplePackingSlip)],
      ['memo', () => renderCreditMemo(sampleCreditMemo)],
    ];
    for (const [name, render] of renders) {
      const a = await render();
      const b = await render();
      expect(sha256Hex(a), name).toBe(sha256Hex(b));
      expect(a.equals(b), name).toBe(true);
    }
  });

  it('the dates in the file are the document date, and its identifier follows the content', async () => {
    const a = await renderDeterminationLetter(sampleApprovalLetter);
    const parser = new PDFParse({ data: new Uint8Array(a) });
    const info = await parser.getInfo().finally(() => parser.destroy());
    expect(info.info?.CreationDate).toBe('D:20250612120000Z');
    expect(info.info?.ModDate).toBe('D:20250612120000Z');
    expect(info.info?.Producer).toBe('Lumenproof documents');
    const other = await renderDeterminationLetter({ ...sampleApprovalLetter, claimNumber: 'LP-2025-00418' });
    expect(trailerId(a)).toMatch(/^[0-9a-f]{32}$/);
    expect(trailerId(other)).not.toBe(trailerId(a));
    expect(trailerId(await renderDeterminationLetter(sampleApprovalLetter))).toBe(trailerId(a));
  });

  it('sha256Hex is the standard digest', () => {
    // The SHA-256 of "abc" from FIPS 180-2, appendix B.1.
    expect(sha256Hex(Buffer.from('abc'))).toBe(
      'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    );
  });
});

describe('packing slip', () => {
  it('holds the return number, the claim, the ship-to address, the serials and the handling note', async () => {
    const text = await textOf(await renderPackingSlip(samplePackingSlip));
    const s = samplePackingSlip;
    expect(text).toContain(s.raNumber);
    expect(text).toContain(s.claimNumber);
    expect(text).toContain(s.shipTo.name);
    expect(text).toContain(s.shipTo.line1);
    expect(text).toContain('Dayton OH 45402');
    for (const u of s.units) expect(text).toContain(u.serial!);
    expect(text).toContain('Handling the returned unit');
    expect(text).toContain('do not open, repair or strip it');
    expect(text).toContain(fold(s.instructions!));
  });

  it('its barcode decodes to the return number (Code 128, ISO/IEC 15417)', async () => {
    const png = await code128Png(samplePackingSlip.raNumber);
    expect(await decodeBarcode(png)).toBe(samplePackingSlip.raNumber);
    // ... and the slip carries exactly that image: an opaque PNG's image data is embedded unchanged.
    const pdf = await renderPackingSlip(samplePackingSlip);
    const idat = idatOf(png);
    expect(idat.length).toBeGreaterThan(100);
    expect(pdf.indexOf(idat)).toBeGreaterThan(0);
    expect(pdf.indexOf(idatOf(await code128Png('RA-2025-99999')))).toBe(-1);
  });

  it('the barcode on the rendered page decodes too', async () => {
    const pdf = await renderPackingSlip(samplePackingSlip);
    const parser = new PDFParse({ data: new Uint8Array(pdf) });
    try {
      const shot = await parser.getScreenshot({ scale: 3, imageBuffer: true, imageDataUrl: false });
      expect(await decodeBarcode(shot.pages[0].data)).toBe(samplePackingSlip.raNumber);
    } finally {
      await parser.destroy();
    }
  });
});

describe('credit memo', () => {
  it('holds the number, the claim, the lines, the total and the currency', async () => {
    const text = await textOf(await renderCreditMemo(sampleCreditMemo));
    const m = sampleCreditMemo;
    // 2 units x 192.00 x 66.67 % = 256.0128, half-up to the cent: 256.01.
    expect(memoTotal(m)).toBe('256.01');
    expect(text).toContain(m.memoNumber);
    expect(text).toContain(m.claimNumber);
    expect(text).toContain('$256.01 USD');
    expect(text).toContain('192.00');
    expect(text).toContain('66.67 %');
    expect(text).toContain('USD');
    expect(text).toContain(`This memo settles warranty claim ${m.claimNumber}`);
    expect(text).not.toContain('VOID');
  });

  it('a line can carry the amount as decided, and totals add in cents', () => {
    expect(
      memoTotal({
        lines: [
          { description: 'a', units: 1, unitCredit: '0.10', coveragePercent: 100 },
          { description: 'b', units: 1, unitCredit: '0.20', coveragePercent: 100 },
          { description: 'c', units: 3, unitCredit: '50.00', coveragePercent: 50, amount: '70.00' },
        ],
      }),
    ).toBe('70.30');
  });

  it('a reversal is marked VOID, references the original and shows the amount negated', async () => {
    const text = await textOf(await renderCreditMemo(sampleCreditReversal));
    expect(text).toContain('VOID / reversal');
    expect(text).toContain('Credit memo reversal');
    expect(text).toContain(sampleCreditReversal.memoNumber);
    // The recipient's locale, en-US by default: CLDR en long date "MMMM d, y"
    expect(text).toContain('This memo voids credit memo CM-2025-00031 of June 16, 2025');
    expect(text).toContain('-$256.01 USD');
    expect(text).toContain(sampleCreditReversal.reversal!.reason);
    expect(text).not.toContain('This memo settles');
  });
});

describe('paper', () => {
  it('is US Letter by default and for North American currencies or locales, A4 elsewhere', async () => {
    expect(paperFor()).toBe('letter');
    expect(paperFor({ currency: 'USD' })).toBe('letter');
    expect(paperFor({ currency: 'EUR' })).toBe('a4');
    expect(paperFor({ locale: 'en-GB', currency: 'USD' })).toBe('a4');
    expect(paperFor({ locale: 'fr-CA' })).toBe('letter');
    const a4 = await renderCreditMemo({ ...sampleCreditMemo, currency: 'EUR', paper: 'a4' });
    // A4 is 210 x 297 mm = 595.28 x 841.89 pt (ISO 216); Letter is 8.5 x 11 in = 612 x 792 pt.
    expect(a4.toString('latin1')).toContain('/MediaBox [0 0 595.28 841.89]');
    expect((await renderCreditMemo(sampleCreditMemo)).toString('latin1')).toContain(
      '/MediaBox [0 0 612 792]',
    );
  });
});
