import crypto from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import type { AttachmentPurpose } from '../../../shared/schemas/attachments';
import { recordAuditMany } from '../../lib/audit';
import type { Storage } from '../../lib/storage';
import { ACCEPTED_TYPES, inspectUpload, type InspectedUpload } from '../../lib/uploads/inspect';
import { safeDisplayName } from '../../lib/uploads/names';
import {
  attachmentAddedEvent,
  deleteStored,
  newAttachmentRow,
  storeInspected,
  type StoredKeys,
} from '../../modules/attachments/attachments.service';
import { Attachment } from '../entities/attachment.entity';
import { Claim } from '../entities/claim.entity';
import type { ProductModel } from '../entities/product-model.entity';
import { drawInvoice, drawLedBoard, drawNameplate, drawSite } from './demo-photos';

// The demo claims' evidence: nameplate, failure and site photos and the distributor's invoice, put through the
// upload path (inspectUpload re-encodes each image and makes its thumbnail; storeInspected stores it under new
// random keys; newAttachmentRow makes the row; attachment.added audits it), so a demo file downloads and reads
// exactly like an uploaded one. Drawing and re-encoding cost about a tenth of a second an image, so each picture
// is drawn and inspected once per model (nameplate), per model and failure (LED board) and per variant (site),
// and its bytes are reused: every claim still gets its own stored objects and its own rows.

/** What a claim's evaluation counted: its photos (nameplate, failure, then site, then a second site view) and
 * whether the invoice is on file. */
export type EvidencePlan = { photos: number; proofOfPurchase: boolean };

const LOCATION_TEXT = {
  dry: 'Dry locations only',
  damp: 'Suitable for damp locations',
  wet: 'Suitable for wet locations',
} as const;
/** Invented list prices for the invoices (demo only). */
const UNIT_PRICE: Record<string, string> = {
  high_bay: '148.00',
  wall_pack: '86.00',
  troffer: '64.00',
  corn_lamp: '42.00',
  flood: '129.00',
  strip: '38.00',
};
const SITE_VARIANTS = 3;
/** Images drawn and inspected at once: sharp works on its own threads, the machine has few cores. */
const DRAW_CONCURRENCY = 2;
/** Objects stored at once (disk or S3). */
const STORE_CONCURRENCY = 8;

type LoadedClaim = Claim & { installation: NonNullable<Claim['installation']>; productModel: ProductModel };

type Planned = { claim: LoadedClaim; purpose: AttachmentPurpose; name: string; art: string; at: Date };

const slug = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');
const hashOf = (s: string) => crypto.createHash('sha1').update(s).digest().readUInt32BE(0);

async function pool<T>(items: T[], n: number, fn: (item: T) => Promise<void>) {
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(n, items.length) }, async () => {
      while (next < items.length) await fn(items[next++]);
    }),
  );
}

/** What the board photo shows: every string dark, some strings dark, or all lit (a driver that cycles, a dim
 * or discoloured fixture). One picture per model and case keeps the library small. */
type BoardCase = 'all_dark' | 'some_dark' | 'lit';
function boardCaseOf(c: LoadedClaim): BoardCase {
  if (c.symptoms.includes('dark')) return 'all_dark';
  return c.symptoms.includes('partly_dark') ? 'some_dark' : 'lit';
}

/** The picture (its library key) and the claim's own file name for each file of the plan. */
function filesOf(c: LoadedClaim, plan: EvidencePlan, at: Date): Planned[] {
  const p = c.productModel;
  const serial = c.serials[0] ?? c.installation.lot ?? p.modelNumber;
  const site = hashOf(c.installationId) % SITE_VARIANTS;
  const minutes = (n: number) => new Date(at.getTime() - n * 60_000);
  const photos: Omit<Planned, 'claim'>[] = [
    { purpose: 'nameplate', name: `nameplate-${serial}.jpg`, art: `nameplate:${p.id}`, at: minutes(50) },
    {
      purpose: 'failure',
      name: `led-board-${serial}.jpg`,
      art: `board:${p.id}:${boardCaseOf(c)}`,
      at: minutes(45),
    },
    {
      purpose: 'site',
      name: `site-${slug(c.installation.siteName)}.jpg`,
      art: `site:${site}`,
      at: minutes(40),
    },
    {
      purpose: 'site',
      name: `site-${slug(c.installation.siteName)}-2.jpg`,
      art: `site:${(site + 1) % SITE_VARIANTS}`,
      at: minutes(38),
    },
  ];
  const files = photos
    .slice(0, Math.max(0, Math.min(plan.photos, photos.length)))
    .map((f) => ({ ...f, claim: c }));
  if (plan.proofOfPurchase) {
    files.push({
      claim: c,
      purpose: 'proof_of_purchase',
      name: `invoice-${invoiceNumberOf(c)}.pdf`,
      art: `invoice:${c.installationId}`,
      at: minutes(30),
    });
  }
  return files;
}

const invoiceNumberOf = (c: LoadedClaim) =>
  c.installation.invoiceNumber ?? `INV-${c.installationId.slice(0, 8).toUpperCase()}`;

function drawArt(key: string, c: LoadedClaim): Promise<Buffer> {
  const p = c.productModel;
  const [kind, , extra] = key.split(':');
  if (kind === 'nameplate') {
    return drawNameplate({
      manufacturer: c.manufacturer.name,
      model: p.modelNumber,
      input: `${p.inputVoltsMin}-${p.inputVoltsMax} V AC 50/60 Hz`,
      power: `${p.ratedInputWatts} W`,
      location: LOCATION_TEXT[p.location],
      dateCode: c.installation.lot ?? c.installation.installDate.slice(2, 7).replace('-', ''),
    });
  }
  if (kind === 'board') {
    const strings = Math.min(p.ledStrings, 12);
    const dark =
      extra === 'all_dark' ? strings : extra === 'some_dark' ? Math.max(1, Math.round(strings / 4)) : 0;
    return drawLedBoard({
      strings,
      ledsPerString: p.ledsPerString,
      dark: Array.from({ length: dark }, (_, s) => [(s * 3 + 1) % strings, -1] as [number, number]),
      seed: key,
    });
  }
  if (kind === 'site') return drawSite({ seed: `site-${key}`, fixtures: 4 + Number(key.split(':')[1]) });
  const inst = c.installation;
  return drawInvoice({
    distributor: inst.distributor ?? 'Northgate Electrical Supply',
    invoiceNumber: invoiceNumberOf(c),
    date: inst.purchaseDate ?? inst.installDate,
    billTo: c.contractor.name,
    shipTo: `${inst.siteName}, ${inst.siteAddress}, ${inst.siteCity} ${inst.siteRegion} ${inst.sitePostalCode}`,
    model: p.modelNumber,
    description: p.name,
    quantity: inst.quantity,
    unitPrice: UNIT_PRICE[p.family] ?? '75.00',
  });
}

/**
 * Attaches each planned claim's evidence (see above), inside the seed's transaction. The claims' installer
 * uploaded them shortly before filing (a draft's files: shortly before now).
 */
export async function seedDemoEvidence(
  m: EntityManager,
  storage: Storage,
  plans: Map<string, EvidencePlan>,
  now: Date,
) {
  if (!plans.size) return { attachments: 0, drawn: 0 };
  const claims = (await m.find(Claim, {
    where: { id: In([...plans.keys()]) },
    relations: { installation: true, productModel: true, manufacturer: true, contractor: true },
    order: { createdAt: 'ASC', id: 'ASC' },
  })) as LoadedClaim[];
  // Every demo claim has the installer who made it; a claim without one would have no uploader to name.
  const files = claims
    .filter((c) => c.createdById)
    .flatMap((c) => filesOf(c, plans.get(c.id)!, c.filedAt ?? now));

  // The library: each picture drawn and inspected (re-encoded, thumbnailed) once, as an upload would be.
  const art = new Map<string, InspectedUpload>();
  const firstUse = new Map<string, LoadedClaim>();
  for (const f of files) if (!firstUse.has(f.art)) firstUse.set(f.art, f.claim);
  await pool([...firstUse], DRAW_CONCURRENCY, async ([key, c]) => {
    art.set(
      key,
      await inspectUpload(await drawArt(key, c), key.startsWith('invoice') ? 'invoice.pdf' : 'photo.jpg'),
    );
  });

  const stored: StoredKeys[] = [];
  const rows: Attachment[] = [];
  try {
    await pool(files, STORE_CONCURRENCY, async (f) => {
      const inspected = art.get(f.art)!;
      const keys = await storeInspected(storage, inspected);
      stored.push(keys);
      const displayName = safeDisplayName(
        f.name,
        ACCEPTED_TYPES[inspected.contentType].extensions,
        inspected.kind,
      );
      const row = newAttachmentRow(m, {
        owner: { type: 'claim', id: f.claim.id },
        uploader: { id: f.claim.createdById!, organizationId: f.claim.contractorId },
        purpose: f.purpose,
        inspected: { ...inspected, displayName },
        stored: keys,
        createdAt: f.at,
      });
      row.id = crypto.randomUUID();
      rows.push(row);
    });
    rows.sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id));
    for (let i = 0; i < rows.length; i += 200) await m.insert(Attachment, rows.slice(i, i + 200));
    const byUploader = new Map<string, Attachment[]>();
    for (const r of rows) byUploader.set(r.uploadedById, [...(byUploader.get(r.uploadedById) ?? []), r]);
    for (const [userId, list] of byUploader) {
      const events = list
        .map((r) => attachmentAddedEvent(r))
        .map((e) => ({ ...e, after: { ...e.after, source: 'demo' } }));
      await recordAuditMany(m, { userId, organizationId: list[0].organizationId }, events);
    }
  } catch (err) {
    // The seed's transaction rolls back: its files go too.
    for (const keys of stored) await deleteStored(storage, keys, () => {});
    throw err;
  }
  return { attachments: rows.length, drawn: art.size };
}
