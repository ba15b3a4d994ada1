import type { Address } from '../../../shared/claims/actions.schema';
import { code128Png } from './barcode';
import { PdfBuilder, type PaperSize } from './document';
import type { Party } from './determination-letter';
import { formatDate } from './format';
import { loadLayout } from './layout';

export type PackingSlipData = {
  /** The return authorisation number, printed and encoded in the barcode. */
  raNumber: string;
  claimNumber: string;
  issuedOn: string;
  manufacturer: Party;
  contractor: Party;
  shipTo: Address;
  product: { model: string; name: string };
  units: readonly { serial?: string }[];
  /** The reviewer's own instructions, from the return request. */
  instructions?: string;
  paper?: PaperSize;
  /** The recipient's locale (their organisation's): how dates read. Default en-US. */
  locale?: string;
};

const SECTIONS = ['opening', 'barcode', 'addresses', 'contents', 'packing', 'handling'] as const;

export function addressLines(a: Address): string[] {
  return [
    a.name,
    ...(a.attention ? [`Attn: ${a.attention}`] : []),
    a.line1,
    ...(a.line2 ? [a.line2] : []),
    [a.city, a.region, a.postalCode].filter(Boolean).join(' '),
    a.country,
  ];
}

/** The slip that goes in the box with a returned unit. */
export async function renderPackingSlip(data: PackingSlipData): Promise<Buffer> {
  const layout = loadLayout('packing-slip');
  const barcode = await code128Png(data.raNumber);
  const view = {
    raNumber: data.raNumber,
    claimNumber: data.claimNumber,
    manufacturer: data.manufacturer.name,
  };
  const pdf = new PdfBuilder({
    date: data.issuedOn,
    title: layout.title,
    reference: data.raNumber,
    footer: layout.footer(view),
    paper: data.paper,
    content: { kind: 'packing-slip', data },
  });
  const L = (k: string) => layout.label(k);

  for (const section of layout.sections(SECTIONS)) {
    switch (section.id) {
      case 'opening':
        pdf.title(
          layout.title,
          `${L('raNumber')} ${data.raNumber} · ${formatDate(data.issuedOn, data.locale)}`,
        );
        pdf.fields(
          [
            [L('raNumber'), data.raNumber],
            [L('claimNumber'), data.claimNumber],
            [L('issuedOn'), formatDate(data.issuedOn, data.locale)],
          ],
          3,
        );
        if (section.text) pdf.paragraph(layout.fill(section.text, view));
        break;
      case 'barcode':
        pdf.space(4);
        pdf.image(barcode, { width: 230, align: 'center' });
        if (section.text) pdf.paragraph(section.text, { muted: true, size: 7.5, align: 'center' });
        break;
      case 'addresses':
        pdf.heading(section.heading ?? '');
        pdf.fields([
          [L('shipTo'), addressLines(data.shipTo).join('\n')],
          [L('shipFrom'), [data.contractor.name, ...(data.contractor.address ?? [])].join('\n')],
        ]);
        break;
      case 'contents':
        pdf.heading(section.heading ?? '');
        pdf.table(
          [
            { header: L('index'), width: 0.07, align: 'right' },
            { header: L('product'), width: 0.58 },
            { header: L('serial'), width: 0.35, mono: true },
          ],
          data.units.map((u, i) => [
            String(i + 1),
            `${data.product.model} · ${data.product.name}`,
            u.serial ?? L('noSerial'),
          ]),
        );
        break;
      case 'packing':
        pdf.heading(section.heading ?? '');
        for (const line of (section.text ?? '').split('\n')) pdf.paragraph(`•  ${line}`);
        if (data.instructions) {
          pdf.paragraph(L('reviewerInstructions'), { bold: true });
          pdf.paragraph(data.instructions);
        }
        break;
      case 'handling':
        pdf.callout(section.title ?? '', section.text ?? '', 'note');
        break;
    }
  }
  return pdf.finish();
}
