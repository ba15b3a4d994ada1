import zlib from 'node:zlib';
import {
  PDFArray,
  PDFDict,
  PDFInvalidObject,
  PDFName,
  PDFObjectStreamParser,
  PDFParser,
  PDFRef,
  PDFStream,
  PDFXRefStreamParser,
  type PDFContext,
  type PDFObject,
  type PDFRawStream,
} from 'pdf-lib';
import { AppError } from '../errors';

// A PDF is refused when it can act on its own: scripts, launching programs, embedded files, opening a web
// address or another document, sending or importing form data, rich media and XFA forms. The file is parsed
// with pdf-lib's parser (names with #xx escapes undone, NUL read as the white space the PDF standard says it is,
// object streams decoded), and every object it holds is walked, every dictionary and array inside it, not only
// those reachable from the catalog: a reader repairing a damaged file finds the others too.
//
// Two ways a reader and a parser can disagree about which objects a file holds are closed as well:
// - an object number defined twice (an incremental update, or a trick: the cross-reference table may point at
//   either definition): every definition is checked, not only the one pdf-lib keeps;
// - an object hidden inside another object's data (a stream whose /Length swallows it, where a reader going
//   through the cross-reference table still finds it): every "N G obj" header in the bytes that the parse did
//   not start at is parsed on its own and checked too.
// A PDF the parser cannot read is refused: what cannot be read cannot be checked.
//
// Refused, not rewritten: the stored file is the contractor's evidence as sent (its hash is kept), and a rewrite
// is only as safe as the rewriter's knowledge of every feature it must strip. The message says what to do.

/** Dictionary keys that make a PDF active wherever they appear. */
const ACTIVE_KEYS = new Set([
  'JS',
  'JavaScript',
  'AA', // additional actions: run on open, close, page view, field focus, keystroke...
  'EmbeddedFiles',
  'EmbeddedFile',
  'EF',
  'RichMedia',
  'RichMediaContent',
  'XFA',
  'Launch',
]);
/** Names that, as an action type (/S), an annotation /Subtype or an object /Type, make a PDF active. */
const ACTIVE_NAMES = new Set([
  'JavaScript',
  'Launch',
  'SubmitForm',
  'ImportData',
  'GoToR',
  'GoToE',
  'Rendition',
  'RichMedia',
  'RichMediaExecute',
  'FileAttachment',
  'EmbeddedFile',
]);
const TYPE_KEYS = ['S', 'Subtype', 'Type'];
/** What a document may do on opening: show a page (an explicit destination, or a GoTo action). */
const PASSIVE_OPEN_ACTIONS = new Set(['GoTo']);
const MAX_DEPTH = 200;
/** What the object and cross-reference streams of one file may expand to, all together. */
const MAX_DECODED_BYTES = 64 * 1024 * 1024;

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
const pdfEncrypted = () =>
  new AppError(
    422,
    'attachment.pdf_encrypted',
    'This PDF is password-protected or encrypted. Save a copy without protection and upload that.',
  );
const pdfActive = (name: string) =>
  new AppError(
    422,
    'attachment.pdf_active_content',
    'This PDF contains scripts, actions or embedded files, which are not accepted. Print it to a new PDF, or scan the paper copy, and upload that.',
    [{ path: 'file', message: `It contains /${name}.` }],
  );

const nameOf = (n: PDFName) => n.decodeText();

// pdf-lib expands object streams and cross-reference streams while it parses, without a limit: a few KB of
// Flate can expand to gigabytes. Each such stream is first inflated here against the file's budget (kept per
// parse, on its PDFContext), and only Flate (or no filter) is let through to pdf-lib.
type Budget = { left: number; error?: AppError };
const budgets = new WeakMap<PDFContext, Budget>();

function guardExpansion(raw: PDFRawStream) {
  const budget = budgets.get(raw.dict.context);
  if (!budget) return; // not a parse of ours
  try {
    expand(raw, budget);
  } catch (err) {
    // pdf-lib catches what its parse throws and throws its own error: the reason is kept here.
    budget.error ??= err as AppError;
    throw err;
  }
}

function expand(raw: PDFRawStream, budget: Budget) {
  const filter = raw.dict.lookup(PDFName.of('Filter'));
  const filters =
    filter instanceof PDFArray ? filter.asArray() : filter === undefined ? [] : [filter as PDFObject];
  const names = filters.map((f) => (f instanceof PDFName ? nameOf(f) : '?'));
  if (names.some((n) => n !== 'FlateDecode' && n !== 'Fl') || names.length > 1)
    throw pdfUncheckable('an unusual encoding of its objects');
  let size = raw.contents.length;
  if (names.length) {
    try {
      size = zlib.inflateSync(raw.contents, {
        finishFlush: zlib.constants.Z_SYNC_FLUSH,
        maxOutputLength: Math.max(1, budget.left),
      }).length;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ERR_BUFFER_TOO_LARGE')
        throw pdfUncheckable('it expands to too much data');
      throw pdfUnreadable();
    }
  }
  budget.left -= size;
  if (budget.left < 0) throw pdfUncheckable('it expands to too much data');
}

const forObjectStream = PDFObjectStreamParser.forStream;
PDFObjectStreamParser.forStream = (raw, shouldWaitForTick) => {
  guardExpansion(raw);
  return forObjectStream(raw, shouldWaitForTick);
};
const forXRefStream = PDFXRefStreamParser.forStream;
PDFXRefStreamParser.forStream = (raw) => {
  guardExpansion(raw);
  return forXRefStream(raw);
};

/** Every object the parser meets, each definition of a number included, with the offsets it parsed them at. */
type Collected = { objects: PDFObject[]; parsedAt: Set<number>; budget: Budget };

function collectingParser(bytes: Uint8Array, collected: Collected) {
  // objectsPerTick Infinity: no yielding to the event loop between objects (the whole parse is a few ms);
  // throwOnInvalidObject: an object it cannot parse fails the parse instead of being skipped.
  const parser = PDFParser.forBytesWithOptions(bytes, Infinity, true, false);
  budgets.set((parser as unknown as { context: PDFContext }).context, collected.budget);
  const internals = parser as unknown as {
    context: PDFContext;
    bytes: { offset(): number; moveTo(o: number): void };
    parseIndirectObject(): Promise<PDFRef>;
  };
  const assign = internals.context.assign.bind(internals.context);
  internals.context.assign = (ref: PDFRef, object: PDFObject) => {
    collected.objects.push(object);
    assign(ref, object);
  };
  const parseIndirectObject = internals.parseIndirectObject.bind(parser);
  internals.parseIndirectObject = () => {
    collected.parsedAt.add(internals.bytes.offset());
    return parseIndirectObject();
  };
  return { parser, internals };
}

/** Throws pdfActive if the object, or anything written inside it, makes the PDF active. */
function checkObject(obj: PDFObject, context: PDFContext, depth = 0): void {
  if (depth > MAX_DEPTH) throw pdfUncheckable('it is nested too deeply');
  if (obj instanceof PDFStream) return checkObject(obj.dict, context, depth + 1);
  if (obj instanceof PDFArray) {
    for (const item of obj.asArray()) checkObject(item, context, depth + 1);
    return;
  }
  if (!(obj instanceof PDFDict)) return;
  for (const [key, value] of obj.entries()) {
    const k = nameOf(key);
    if (ACTIVE_KEYS.has(k)) throw pdfActive(k);
    if (TYPE_KEYS.includes(k) && value instanceof PDFName && ACTIVE_NAMES.has(nameOf(value)))
      throw pdfActive(nameOf(value));
    if (k === 'OpenAction') {
      const action = value instanceof PDFRef ? context.lookup(value) : value;
      // Opening at a page (an explicit destination, an array) is fine; so is a GoTo action. Anything else, a
      // URI opened on opening included, is an action the reader would take unasked.
      if (action instanceof PDFDict) {
        const s = action.get(PDFName.of('S'));
        const type = s instanceof PDFName ? nameOf(s) : '?';
        if (!PASSIVE_OPEN_ACTIONS.has(type)) throw pdfActive(`OpenAction /${type}`);
      } else if (!(action instanceof PDFArray) && action !== undefined) throw pdfActive('OpenAction');
    }
    checkObject(value, context, depth + 1);
  }
}

const OBJECT_HEADER = /(?<![0-9])[0-9]{1,10}[\0\t\n\f\r ]+[0-9]{1,5}[\0\t\n\f\r ]+obj(?![A-Za-z0-9])/g;

/** Throws an AppError (422) unless the bytes are a complete, passive PDF. */
export async function checkPdf(buf: Buffer): Promise<void> {
  const tail = buf.subarray(Math.max(0, buf.length - 2048)).toString('latin1');
  const end = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(tail);
  if (!/^%PDF-[12]\.\d/.test(buf.subarray(0, 16).toString('latin1')) || !end || Number(end[1]) >= buf.length)
    throw pdfUnreadable();

  const bytes = new Uint8Array(buf.buffer, buf.byteOffset, buf.length);
  const budget: Budget = { left: MAX_DECODED_BYTES };
  const collected: Collected = { objects: [], parsedAt: new Set(), budget };
  const { parser, internals } = collectingParser(bytes, collected);
  let context: PDFContext;
  try {
    context = await parser.parseDocument();
  } catch {
    if (internals.context.trailerInfo.Encrypt) throw pdfEncrypted();
    throw budget.error ?? pdfUnreadable();
  }
  if (context.trailerInfo.Encrypt) throw pdfEncrypted();
  const catalog = context.lookup(context.trailerInfo.Root);
  if (!(catalog instanceof PDFDict) || !(catalog.lookup(PDFName.of('Pages')) instanceof PDFDict))
    throw pdfUnreadable();

  // Object headers the parse did not start at: inside another object's data, or after bytes it skipped.
  const hidden: Collected = { objects: [], parsedAt: new Set(), budget };
  const text = buf.toString('latin1');
  let second: ReturnType<typeof collectingParser> | null = null;
  // Headers inside headers (strings in strings) would make this quadratic: what it may read is bounded.
  let readLeft = 2 * buf.length + 1024 * 1024;
  for (const m of text.matchAll(OBJECT_HEADER)) {
    if (collected.parsedAt.has(m.index)) continue;
    second ??= collectingParser(bytes, hidden);
    try {
      second.internals.bytes.moveTo(m.index);
      await second.internals.parseIndirectObject();
    } catch {
      // Not an object after all (binary data that happens to spell a header): a reader cannot use it either.
      // An object stream too large to expand is another matter.
      if (budget.error) throw budget.error;
    }
    readLeft -= second.internals.bytes.offset() - m.index;
    if (readLeft < 0) throw pdfUncheckable('it has too many objects inside other objects');
  }

  for (const obj of collected.objects) {
    if (obj instanceof PDFInvalidObject) throw pdfUnreadable();
    checkObject(obj, context);
  }
  for (const obj of hidden.objects) checkObject(obj, second!.internals.context);
  const trailer = context.trailerInfo;
  for (const obj of [trailer.Info, trailer.ID]) if (obj) checkObject(obj, context);
}
