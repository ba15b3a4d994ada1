import zlib from 'node:zlib';
import { AppError } from '../errors';

// A PDF is refused when it can act on its own: scripts, launching programs, embedded files, automatic actions,
// rich media and XFA forms. The check reads every name in the file's objects, with #xx escapes undone: those
// written out plainly and those packed inside object streams (usually Flate-compressed, which is where such
// things hide). Other streams (page content, fonts, images, colour profiles) cannot hold objects, and their
// bytes are not read as names: binary data would match by chance. An object stream it cannot decode it does not
// guess about: the PDF is refused.

const ACTIVE_NAMES = new Set([
  'JavaScript',
  'JS',
  'Launch',
  'EmbeddedFile',
  'EmbeddedFiles',
  'AA',
  'OpenAction',
  'RichMedia',
  'XFA',
  'SubmitForm',
  'ImportData',
  'GoToE',
]);
const MAX_DECODED_BYTES = 96 * 1024 * 1024;

export const pdfUnreadable = () =>
  new AppError(
    422,
    'attachment.unreadable',
    'This PDF is damaged or incomplete. Export or save it again and upload the new file.',
  );
const pdfUncheckable = (why: string) =>
  new AppError(
    422,
    'attachment.unreadable',
    `This PDF could not be checked (${why}). Print it to a new PDF, or scan the paper copy, and upload that.`,
  );
const pdfActive = (name: string) =>
  new AppError(
    422,
    'attachment.pdf_active_content',
    'This PDF contains scripts, actions or embedded files, which are not accepted. Print it to a new PDF, or scan the paper copy, and upload that.',
    [{ path: 'file', message: `It contains /${name}.` }],
  );

const decodeName = (raw: string) =>
  raw.replace(/#([0-9A-Fa-f]{2})/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16)));

/** Every PDF name in a piece of text, #xx escapes undone, with what follows it. */
function* namesIn(text: string): Generator<{ name: string; index: number; end: number }> {
  const re = /\/([^\s/<>[\]()%{}]+)/g;
  for (let m = re.exec(text); m; m = re.exec(text))
    yield { name: decodeName(m[1]), index: m.index, end: re.lastIndex };
}

function scanForActive(text: string) {
  for (const { name, end } of namesIn(text)) {
    if (!ACTIVE_NAMES.has(name)) continue;
    if (name === 'OpenAction') {
      // Opening at a page and zoom (an explicit destination, an array) is fine; anything else is an action.
      const next = text.slice(end, end + 32).trimStart();
      if (next.startsWith('[')) continue;
    }
    throw pdfActive(name);
  }
}

function asciiHexDecode(data: Buffer): Buffer {
  const hex = data.toString('latin1').replace(/\s+/g, '').replace(/>.*$/s, '');
  return Buffer.from(hex.length % 2 ? `${hex}0` : hex, 'hex');
}

function ascii85Decode(data: Buffer): Buffer {
  const s = data.toString('latin1').replace(/\s+/g, '').replace(/^<~/, '').replace(/~>.*$/s, '');
  const out: number[] = [];
  let group: number[] = [];
  const flush = (n: number) => {
    let v = 0;
    for (const d of group) v = v * 85 + d;
    const bytes = [(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255];
    out.push(...bytes.slice(0, n));
  };
  for (const ch of s) {
    if (ch === 'z' && group.length === 0) {
      out.push(0, 0, 0, 0);
      continue;
    }
    const d = ch.charCodeAt(0) - 33;
    if (d < 0 || d > 84) throw pdfUnreadable();
    group.push(d);
    if (group.length === 5) {
      flush(4);
      group = [];
    }
  }
  if (group.length) {
    const n = group.length - 1;
    while (group.length < 5) group.push(84);
    flush(n);
  }
  return Buffer.from(out);
}

/** Undoes the PNG row predictors (10-15) that Flate streams may carry. */
function pngUnpredict(data: Buffer, columns: number, colors: number, bpc: number): Buffer {
  const bpp = Math.max(1, Math.ceil((colors * bpc) / 8));
  const rowLen = Math.ceil((columns * colors * bpc) / 8);
  const rows = Math.floor(data.length / (rowLen + 1));
  const out = Buffer.alloc(rows * rowLen);
  for (let r = 0; r < rows; r++) {
    const type = data[r * (rowLen + 1)];
    const src = r * (rowLen + 1) + 1;
    const dst = r * rowLen;
    for (let i = 0; i < rowLen; i++) {
      const raw = data[src + i];
      const left = i >= bpp ? out[dst + i - bpp] : 0;
      const up = r > 0 ? out[dst - rowLen + i] : 0;
      const upLeft = r > 0 && i >= bpp ? out[dst - rowLen + i - bpp] : 0;
      let v: number;
      if (type === 0) v = raw;
      else if (type === 1) v = raw + left;
      else if (type === 2) v = raw + up;
      else if (type === 3) v = raw + ((left + up) >> 1);
      else if (type === 4) {
        const p = left + up - upLeft;
        const pa = Math.abs(p - left);
        const pb = Math.abs(p - up);
        const pc = Math.abs(p - upLeft);
        v = raw + (pa <= pb && pa <= pc ? left : pb <= pc ? up : upLeft);
      } else throw pdfUncheckable('an unknown predictor');
      out[dst + i] = v & 255;
    }
  }
  return out;
}

function numberIn(dict: string, key: string, fallback: number) {
  const m = new RegExp(`/${key}\\s+(\\d+)`).exec(dict);
  return m ? Number(m[1]) : fallback;
}

type StreamPart = { dict: string; data: Buffer; start: number; end: number };

/** The streams of a PDF: each one's dictionary and its raw bytes. */
function* streamsIn(buf: Buffer, text: string): Generator<StreamPart> {
  const re = />>\s*stream(?:\r\n|\n|\r)/g;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    // Walk back from the closing >> to its matching <<.
    let depth = 0;
    let i = m.index;
    let start = -1;
    const floor = Math.max(0, m.index - 65536);
    for (; i >= floor; i--) {
      if (text.startsWith('>>', i)) {
        depth++;
        i--;
      } else if (text.startsWith('<<', i - 1)) {
        depth--;
        i--;
        if (depth === 0) {
          start = i;
          break;
        }
      }
    }
    if (start < 0) throw pdfUnreadable();
    const dict = text.slice(start, m.index + 2);
    const dataStart = re.lastIndex;
    let dataEnd = -1;
    const len = /\/Length\s+(\d+)(?!\s+\d+\s+R)/.exec(dict);
    if (len) {
      const end = dataStart + Number(len[1]);
      if (end <= buf.length && /^\s*endstream/.test(text.slice(end, end + 24))) dataEnd = end;
    }
    if (dataEnd < 0) {
      const at = text.indexOf('endstream', dataStart);
      if (at < 0) throw pdfUnreadable();
      dataEnd = at;
      if (text[dataEnd - 1] === '\n') dataEnd--;
      if (text[dataEnd - 1] === '\r') dataEnd--;
    }
    re.lastIndex = dataEnd;
    yield { dict, data: buf.subarray(dataStart, dataEnd), start: dataStart, end: dataEnd };
  }
}

function filtersOf(dict: string): string[] {
  const m = /\/Filter\s*(\[[^\]]*\]|\/[^\s/<>[\]()%{}]+)/.exec(dict);
  if (!m) return [];
  return Array.from(namesIn(m[1]), (n) => n.name);
}

const isObjectStream = (dict: string) => /\/Type\s*\/ObjStm\b/.test(decodeName(dict));

function decodeStream(part: StreamPart, budget: { left: number }): Buffer {
  let data = part.data;
  for (const filter of filtersOf(part.dict)) {
    if (filter === 'FlateDecode' || filter === 'Fl') {
      if (budget.left <= 0) throw pdfUncheckable('it expands to too much data');
      try {
        data = zlib.inflateSync(data, {
          finishFlush: zlib.constants.Z_SYNC_FLUSH,
          maxOutputLength: budget.left,
        });
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ERR_BUFFER_TOO_LARGE')
          throw pdfUncheckable('it expands to too much data');
        throw pdfUncheckable('a compressed part is damaged');
      }
      const predictor = numberIn(part.dict, 'Predictor', 1);
      if (predictor >= 10) {
        data = pngUnpredict(
          data,
          numberIn(part.dict, 'Columns', 1),
          numberIn(part.dict, 'Colors', 1),
          numberIn(part.dict, 'BitsPerComponent', 8),
        );
      } else if (predictor > 1) throw pdfUncheckable('an unusual compression predictor');
    } else if (filter === 'ASCIIHexDecode' || filter === 'AHx') data = asciiHexDecode(data);
    else if (filter === 'ASCII85Decode' || filter === 'A85') data = ascii85Decode(data);
    else throw pdfUncheckable(`the ${filter} encoding`);
    budget.left -= data.length;
  }
  return data;
}

/** Throws an AppError (422) unless the bytes are a complete, passive PDF. */
export function checkPdf(buf: Buffer): void {
  const text = buf.toString('latin1');
  const tail = text.slice(-2048);
  const wellFormed =
    /^%PDF-[12]\.\d/.test(text) &&
    /%%EOF\s*$/.test(tail) &&
    /startxref\s+\d+\s+%%EOF\s*$/.test(tail) &&
    /\d+\s+\d+\s+obj\b/.test(text) &&
    /\/Root\s+\d+\s+\d+\s+R/.test(text);
  if (!wellFormed) throw pdfUnreadable();
  const startxref = Number(/startxref\s+(\d+)\s+%%EOF\s*$/.exec(tail)![1]);
  if (startxref >= buf.length) throw pdfUnreadable();
  if (/\/Encrypt\s+(\d+\s+\d+\s+R|<<)/.test(text)) {
    throw new AppError(
      422,
      'attachment.pdf_encrypted',
      'This PDF is password-protected or encrypted. Save a copy without protection and upload that.',
    );
  }

  const budget = { left: MAX_DECODED_BYTES };
  let from = 0;
  for (const part of streamsIn(buf, text)) {
    scanForActive(text.slice(from, part.start));
    from = part.end;
    if (isObjectStream(part.dict)) scanForActive(decodeStream(part, budget).toString('latin1'));
  }
  scanForActive(text.slice(from));
}
