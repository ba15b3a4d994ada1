import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { demoPhotosFor, drawLedBoard } from '../../server/db/seed/demo-photos';
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
});
