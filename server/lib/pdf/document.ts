import fs from 'node:fs';
import path from 'node:path';
import * as fontkit from 'fontkit';
import PDFDocument from 'pdfkit';

import { canonicalJson, sha256Hex } from './hash';
import { dateAsTimestamp } from './format';
import { projectPath } from '../paths';

// A small builder over pdfkit for Lumenproof's documents: our fonts, our header band and footer, page numbers,
// a few blocks (headings, paragraphs, label/value grids, tables, callouts), and deterministic output: the same
// input gives the same bytes, because every date and identifier in the file comes from the input.

const FONT_DIR = projectPath('node_modules', 'dejavu-fonts-ttf', 'ttf');

// pdfkit draws WOFF2 fonts blank; TrueType only.
export const FONTS = {
  sans: path.join(FONT_DIR, 'DejaVuSans.ttf'),
  bold: path.join(FONT_DIR, 'DejaVuSans-Bold.ttf'),
  mono: path.join(FONT_DIR, 'DejaVuSansMono.ttf'),
} as const;

type FontName = keyof typeof FONTS;

// Each font file is read and parsed once per process and the parsed font handed to every document: pdfkit would
// otherwise read the file from disk and parse its tables again for each document (most of a letter's time). A
// parsed font is only read from afterwards (each document makes its own subset), so sharing it is safe.
let parsedFonts: Record<FontName, fontkit.Font> | null = null;
function parsedFont(name: FontName): fontkit.Font {
  parsedFonts ??= {
    sans: fontkit.create(fs.readFileSync(FONTS.sans)),
    bold: fontkit.create(fs.readFileSync(FONTS.bold)),
    mono: fontkit.create(fs.readFileSync(FONTS.mono)),
  };
  return parsedFonts[name];
}

export const COLORS = {
  teal: '#0d5c57',
  tealTint: '#e7f1f0',
  ink: '#1b2320',
  muted: '#5c6b65',
  rule: '#cfd8d5',
  caution: '#a05a00',
  cautionTint: '#fdf3e3',
  void: '#b42318',
} as const;

export type PaperSize = 'letter' | 'a4';

const PAPER: Record<PaperSize, [number, number]> = { letter: [612, 792], a4: [595.28, 841.89] };

const LETTER_CURRENCIES = new Set(['USD', 'CAD', 'MXN']);
const LETTER_REGIONS = new Set(['US', 'CA', 'MX', 'PH', 'CL', 'CO', 'VE', 'GT', 'CR']);

/**
 * US Letter where it is the common paper (North America and a few others), A4 elsewhere. A locale's region
 * ("en-US", "fr-CA") decides when given, else the currency; Letter when neither says.
 */
export function paperFor(opts: { currency?: string; locale?: string } = {}): PaperSize {
  const region = opts.locale?.split(/[-_]/)[1]?.toUpperCase();
  if (region) return LETTER_REGIONS.has(region) ? 'letter' : 'a4';
  if (opts.currency) return LETTER_CURRENCIES.has(opts.currency) ? 'letter' : 'a4';
  return 'letter';
}

export type DocumentOptions = {
  /** The document's own date (YYYY-MM-DD): its PDF creation and modification date. */
  date: string;
  title: string;
  /** Shown at the right of the header band, e.g. the claim or memo number. */
  reference: string;
  /** The footer's text (left side). */
  footer: string;
  paper?: PaperSize;
  /** The data the document is made from; its digest becomes the PDF's identifier. */
  content: unknown;
};

const MARGIN_X = 54;
const MARGIN_TOP = 92;
const MARGIN_BOTTOM = 66;
const BODY = 9.5;

export type Column = { header: string; width: number; align?: 'left' | 'right' | 'center'; mono?: boolean };

export class PdfBuilder {
  readonly doc: PDFKit.PDFDocument;
  private readonly chunks: Buffer[] = [];
  private readonly done: Promise<Buffer>;

  constructor(private readonly opts: DocumentOptions) {
    const when = dateAsTimestamp(opts.date);
    const info = {
      Title: opts.title,
      Author: 'Lumenproof',
      Subject: opts.reference,
      Producer: 'Lumenproof documents',
      Creator: 'Lumenproof',
      CreationDate: when,
      ModDate: when,
      // pdfkit derives the file identifier from the info dictionary: the content's digest makes it the content's.
      LumenproofDigest: sha256Hex(canonicalJson(opts.content)),
    };
    this.doc = new PDFDocument({
      size: PAPER[opts.paper ?? 'letter'],
      margins: { top: MARGIN_TOP, bottom: MARGIN_BOTTOM, left: MARGIN_X, right: MARGIN_X },
      bufferPages: true,
      autoFirstPage: false,
      // No default font: pdfkit would open one now and compare it field by field with 'Sans' when that is chosen.
      font: null as unknown as string,
      info: info as PDFKit.DocumentInfo,
      pdfVersion: '1.7',
      lang: 'en',
      displayTitle: true,
    });
    this.doc.registerFont('Sans', parsedFont('sans') as unknown as string);
    this.doc.registerFont('Sans-Bold', parsedFont('bold') as unknown as string);
    this.doc.registerFont('Mono', parsedFont('mono') as unknown as string);
    this.doc.font('Sans');
    this.done = new Promise((resolve, reject) => {
      this.doc.on('data', (c: Buffer) => this.chunks.push(c));
      this.doc.on('end', () => resolve(Buffer.concat(this.chunks)));
      this.doc.on('error', reject);
    });
    this.doc.on('pageAdded', () => this.drawHeader());
    this.doc.addPage();
  }

  get left() {
    return this.doc.page.margins.left;
  }
  get contentWidth() {
    return this.doc.page.width - this.doc.page.margins.left - this.doc.page.margins.right;
  }
  private get bottom() {
    return this.doc.page.height - this.doc.page.margins.bottom;
  }

  private drawHeader() {
    const d = this.doc;
    const top = 36;
    const saved = { x: d.x, y: d.y };
    // The wordmark: a small lit lamp (a teal disc with a pale core) beside the name.
    d.save();
    d.circle(MARGIN_X + 7, top + 9, 7).fill(COLORS.teal);
    d.circle(MARGIN_X + 7, top + 9, 2.6).fill('#bfe3df');
    d.restore();
    d.font('Sans-Bold').fontSize(15).fillColor(COLORS.teal);
    d.text('Lumenproof', MARGIN_X + 20, top, { lineBreak: false });
    d.font('Sans').fontSize(8).fillColor(COLORS.muted);
    const right = d.page.width - MARGIN_X;
    const title = this.opts.title.toUpperCase();
    d.text(title, right - 300, top + 1, {
      width: 300,
      align: 'right',
      characterSpacing: 0.6,
      lineBreak: false,
    });
    d.font('Mono').fontSize(8.5).fillColor(COLORS.ink);
    d.text(this.opts.reference, right - 300, top + 12, { width: 300, align: 'right', lineBreak: false });
    d.save();
    d.rect(MARGIN_X, top + 28, d.page.width - 2 * MARGIN_X, 2.2).fill(COLORS.teal);
    d.restore();
    d.fillColor(COLORS.ink).font('Sans').fontSize(BODY);
    d.x = saved.x;
    d.y = MARGIN_TOP;
  }

  /** Footers and "Page n of m" go on at the end, when the number of pages is known. */
  private drawFooters() {
    const d = this.doc;
    const range = d.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      d.switchToPage(i);
      const savedBottom = d.page.margins.bottom;
      d.page.margins.bottom = 0; // writing below the margin must not start a new page
      const y = d.page.height - 46;
      d.save();
      d.moveTo(MARGIN_X, y - 6)
        .lineTo(d.page.width - MARGIN_X, y - 6)
        .lineWidth(0.6)
        .strokeColor(COLORS.rule)
        .stroke();
      d.restore();
      d.font('Sans').fontSize(7.5).fillColor(COLORS.muted);
      d.text(this.opts.footer, MARGIN_X, y, { width: this.contentWidth - 90, lineBreak: true, height: 24 });
      d.text(`Page ${i - range.start + 1} of ${range.count}`, d.page.width - MARGIN_X - 90, y, {
        width: 90,
        align: 'right',
        lineBreak: false,
      });
      d.page.margins.bottom = savedBottom;
    }
  }

  /** Starts a new page unless `height` points still fit on this one. */
  ensureSpace(height: number) {
    if (this.doc.y + height > this.bottom) this.doc.addPage();
  }

  space(points = 8) {
    this.doc.y += points;
  }

  title(text: string, subtitle?: string) {
    const d = this.doc;
    d.font('Sans-Bold')
      .fontSize(18)
      .fillColor(COLORS.ink)
      .text(text, this.left, d.y, { width: this.contentWidth });
    if (subtitle)
      d.font('Sans').fontSize(10).fillColor(COLORS.muted).text(subtitle, { width: this.contentWidth });
    d.fillColor(COLORS.ink);
    this.space(10);
  }

  heading(text: string) {
    const d = this.doc;
    this.ensureSpace(48); // a heading never ends a page alone
    this.space(6);
    d.font('Sans-Bold')
      .fontSize(11)
      .fillColor(COLORS.teal)
      .text(text, this.left, d.y, { width: this.contentWidth });
    const y = d.y + 2;
    d.save();
    d.moveTo(this.left, y)
      .lineTo(this.left + this.contentWidth, y)
      .lineWidth(0.5)
      .strokeColor(COLORS.rule)
      .stroke();
    d.restore();
    d.y = y + 6;
    d.fillColor(COLORS.ink);
  }

  paragraph(
    text: string,
    opts: { bold?: boolean; muted?: boolean; size?: number; align?: 'left' | 'center' | 'right' } = {},
  ) {
    const d = this.doc;
    d.font(opts.bold ? 'Sans-Bold' : 'Sans')
      .fontSize(opts.size ?? BODY)
      .fillColor(opts.muted ? COLORS.muted : COLORS.ink);
    // Keep a short paragraph whole; a long one may run over the page.
    const height = d.heightOfString(text, { width: this.contentWidth, lineGap: 1.5 });
    this.ensureSpace(height > 200 ? 40 : height);
    d.text(text, this.left, d.y, { width: this.contentWidth, lineGap: 1.5, align: opts.align ?? 'left' });
    d.fillColor(COLORS.ink);
    this.space(5);
  }

  /** Label/value pairs in `columns` columns: small grey labels above their values. */
  fields(rows: readonly (readonly [string, string])[], columns = 2) {
    const d = this.doc;
    const gap = 14;
    const colWidth = (this.contentWidth - gap * (columns - 1)) / columns;
    for (let i = 0; i < rows.length; i += columns) {
      const line = rows.slice(i, i + columns);
      d.font('Sans').fontSize(BODY);
      const heights = line.map(([, v]) => d.heightOfString(v || '—', { width: colWidth }));
      const h = 11 + Math.max(...heights);
      this.ensureSpace(h + 6);
      const y = d.y;
      line.forEach(([label, value], j) => {
        const x = this.left + j * (colWidth + gap);
        d.font('Sans').fontSize(7).fillColor(COLORS.muted);
        d.text(label.toUpperCase(), x, y, { width: colWidth, characterSpacing: 0.5, lineBreak: false });
        d.font('Sans').fontSize(BODY).fillColor(COLORS.ink);
        d.text(value || '—', x, y + 10, { width: colWidth });
      });
      d.y = y + h + 6;
    }
    d.x = this.left;
  }

  /** A table; `width`s are fractions of the content width. The header repeats on each new page. */
  table(columns: readonly Column[], rows: readonly (readonly string[])[], opts: { totalRow?: boolean } = {}) {
    const d = this.doc;
    const pad = 4;
    const widths = columns.map((c) => c.width * this.contentWidth);
    const xs = widths.map((_, i) => this.left + widths.slice(0, i).reduce((a, b) => a + b, 0));
    const header = () => {
      d.font('Sans-Bold').fontSize(7.5);
      const h =
        Math.max(...columns.map((c, i) => d.heightOfString(c.header, { width: widths[i] - 2 * pad }))) +
        2 * pad;
      this.ensureSpace(h + 20);
      const y = d.y;
      d.save();
      d.rect(this.left, y, this.contentWidth, h).fill(COLORS.tealTint);
      d.restore();
      columns.forEach((c, i) => {
        d.font('Sans-Bold').fontSize(7.5).fillColor(COLORS.teal);
        d.text(c.header, xs[i] + pad, y + pad, { width: widths[i] - 2 * pad, align: c.align ?? 'left' });
      });
      d.y = y + h;
    };
    header();
    rows.forEach((row, r) => {
      const last = opts.totalRow === true && r === rows.length - 1;
      const font = (c: Column) => (last ? 'Sans-Bold' : c.mono ? 'Mono' : 'Sans');
      const size = BODY - 1;
      const h =
        Math.max(
          ...columns.map((c, i) =>
            d
              .font(font(c))
              .fontSize(size)
              .heightOfString(row[i] ?? '', { width: widths[i] - 2 * pad }),
          ),
        ) +
        2 * pad;
      if (d.y + h > this.bottom) {
        d.addPage();
        header();
      }
      const y = d.y;
      columns.forEach((c, i) => {
        d.font(font(c)).fontSize(size).fillColor(COLORS.ink);
        d.text(row[i] ?? '', xs[i] + pad, y + pad, { width: widths[i] - 2 * pad, align: c.align ?? 'left' });
      });
      d.save();
      d.moveTo(this.left, y + h)
        .lineTo(this.left + this.contentWidth, y + h)
        .lineWidth(last ? 1 : 0.4)
        .strokeColor(last ? COLORS.teal : COLORS.rule)
        .stroke();
      d.restore();
      d.y = y + h;
    });
    d.x = this.left;
    this.space(8);
  }

  /** A boxed note with a coloured bar: `caution` for safety text, `note` for plain emphasis. */
  callout(title: string, body: string, tone: 'caution' | 'note' = 'note') {
    const d = this.doc;
    const pad = 9;
    const width = this.contentWidth - 2 * pad - 4;
    d.font('Sans-Bold').fontSize(BODY);
    const th = d.heightOfString(title, { width });
    d.font('Sans').fontSize(BODY - 0.5);
    const bh = d.heightOfString(body, { width, lineGap: 1.5 });
    const h = th + bh + 2 * pad + 4;
    this.ensureSpace(h + 4);
    const y = d.y;
    const bar = tone === 'caution' ? COLORS.caution : COLORS.teal;
    d.save();
    d.rect(this.left, y, this.contentWidth, h).fill(
      tone === 'caution' ? COLORS.cautionTint : COLORS.tealTint,
    );
    d.rect(this.left, y, 4, h).fill(bar);
    d.restore();
    d.font('Sans-Bold')
      .fontSize(BODY)
      .fillColor(bar)
      .text(title, this.left + 4 + pad, y + pad, { width });
    d.font('Sans')
      .fontSize(BODY - 0.5)
      .fillColor(COLORS.ink)
      .text(body, this.left + 4 + pad, y + pad + th + 4, { width, lineGap: 1.5 });
    d.x = this.left;
    d.y = y + h + 8;
  }

  /** A large diagonal word across the page (e.g. VOID), drawn under what follows. */
  stamp(word: string, color: string = COLORS.void) {
    const d = this.doc;
    const cx = d.page.width / 2;
    const cy = d.page.height / 2;
    const y = d.y;
    d.save();
    d.rotate(-30, { origin: [cx, cy] });
    d.font('Sans-Bold').fontSize(110).fillColor(color).fillOpacity(0.1);
    d.text(word, cx - 300, cy - 60, { width: 600, align: 'center', lineBreak: false });
    d.restore();
    d.fillOpacity(1).fillColor(COLORS.ink);
    d.x = this.left;
    d.y = y;
  }

  image(png: Buffer, opts: { width: number; align?: 'left' | 'center' }) {
    const d = this.doc;
    // A PNG's size is in its IHDR chunk: width and height as big-endian integers at bytes 16 and 20.
    const height = (png.readUInt32BE(20) / png.readUInt32BE(16)) * opts.width;
    this.ensureSpace(height + 6);
    const x = opts.align === 'center' ? this.left + (this.contentWidth - opts.width) / 2 : this.left;
    const y = d.y;
    d.image(png, x, y, { width: opts.width });
    d.x = this.left;
    d.y = y + height + 6;
  }

  /** Finishes the document and answers its bytes. */
  finish(): Promise<Buffer> {
    this.drawFooters();
    this.doc.end();
    return this.done;
  }
}
