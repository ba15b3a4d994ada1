import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { demoPhotosFor, drawInvoice, drawLedBoard, drawNameplate } from '../../server/db/seed/demo-photos';
import { inspectUpload } from '../../server/lib/uploads/inspect';

describe('demo photos', () => {
  it('draws a nameplate, a board with dark LEDs and a site as small 800 x 600 JPEGs that the upload check accepts', async () => {
    const photos = await demoPhotosFor({
      manufacturer: 'Aldercrest Lighting',
      model: 'AHB-150-50K',
      serial: 'AC23-0041872',
      darkStrings: [2],
      site: 'Dock 4, bay 12',
    });
    expect(photos.map((p) => p.purpose)).toEqual(['nameplate', 'failure', 'site']);
    for (const p of photos) {
      const meta = await sharp(p.body).metadata();
      expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 800, 600]);
      expect(p.body.length).toBeLessThan(150 * 1024);
      await expect(inspectUpload(p.body, p.name)).resolves.toMatchObject({
        kind: 'photo',
        contentType: 'image/jpeg',
      });
    }
  });

  it('draws the same picture for the same inputs, and dark segments really are darker', async () => {
    const a = await drawLedBoard({ strings: 4, ledsPerString: 10, dark: [], seed: 's' });
    const b = await drawLedBoard({ strings: 4, ledsPerString: 10, dark: [], seed: 's' });
    expect(a.equals(b)).toBe(true);
    const dark = await drawLedBoard({
      strings: 4,
      ledsPerString: 10,
      dark: [
        [0, -1],
        [1, -1],
      ],
      seed: 's',
    });
    const mean = async (buf: Buffer) => (await sharp(buf).stats()).channels[0].mean;
    expect(await mean(dark)).toBeLessThan(await mean(a));
  });

  it('draws a model’s nameplate without a serial row when none is given', async () => {
    const body = await drawNameplate({ manufacturer: 'Veltra Luminaires', model: 'VL-FL100' });
    await expect(inspectUpload(body, 'nameplate.jpg')).resolves.toMatchObject({
      kind: 'photo',
      width: 800,
      height: 600,
    });
  });

  it('draws a distributor invoice as a passive one-page PDF the upload check keeps as sent, the same bytes each time', async () => {
    const info = {
      distributor: 'Cascade Lamp & Wire',
      invoiceNumber: 'INV-H2024-1017',
      date: '2024-03-04',
      billTo: 'Harborview Electric',
      shipTo: 'Dockside cold store, 18 Wharf Road, Port Elliot WA 98412',
      model: 'AC-HB150-D',
      description: 'Arden round high-bay 150 W',
      quantity: 12,
      unitPrice: '148.00',
    };
    const pdf = await drawInvoice(info);
    expect((await drawInvoice(info)).equals(pdf)).toBe(true);
    const inspected = await inspectUpload(pdf, 'invoice.pdf');
    expect([inspected.kind, inspected.contentType, inspected.body.equals(pdf)]).toEqual([
      'document',
      'application/pdf',
      true,
    ]);
    const text = (await new PDFParse({ data: new Uint8Array(pdf) }).getText()).text;
    expect(text).toContain('INV-H2024-1017');
    // 12 x 148.00 = 1,776.00; demo prices and a demo tax rate, invented: the arithmetic is what is checked.
    expect(text).toContain('1,776.00');
  });
});
