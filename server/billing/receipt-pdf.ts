import { formatMinor, type InvoiceDetail, type PaymentMethod } from '../../src/contracts/billing';
import { newPdfDocument } from '../render/fonts';
import { drawLogoTopRight } from '../render/pdf-letterhead';
import type { LogoImage } from '../clinic/clinic-brand';

const SPRUCE = '#1f5a4a';
const MUTED = '#56645e';

/** "2 Dec 2026" from an ISO timestamp or date (Latin-1 only, like everything in the PDF). */
function day(iso: string | null): string {
  if (!iso) return '-';
  const d = new Date(iso.length === 10 ? `${iso}T00:00:00Z` : iso);
  return d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

/** How the receipt says the invoice was paid. */
export const PAID_BY: Record<PaymentMethod, string> = { card: 'card payment', bank_transfer: 'bank transfer', cash: 'cash' };

/**
 * The seller as the receipt names it: legal name (or the clinic's name until one is set), the
 * address lines, the tax number and the contact line — what invoices must carry in most countries.
 */
export function sellerLines(inv: Pick<InvoiceDetail, 'clinicName' | 'clinicLegal'>): { name: string; lines: string[] } {
  const l = inv.clinicLegal;
  const lines = [...l.address.split('\n').filter(Boolean)];
  if (l.taxNumber) lines.push(`Tax number: ${l.taxNumber}`);
  if (l.contactLine) lines.push(l.contactLine);
  const name = l.legalName || inv.clinicName;
  // The trading name beside a different legal name, so the athlete recognises the clinic.
  if (l.legalName && l.legalName !== inv.clinicName) lines.unshift(`Trading as ${inv.clinicName}`);
  return { name, lines };
}

const rate = (bp: number | null) => (bp === null ? '-' : `${(bp / 100).toFixed(bp % 100 === 0 ? 0 : 2)} %`);

/**
 * The receipt of a paid (or later refunded) invoice, A4, with the shipped Source Sans 3 faces:
 * the clinic's legal details, number, athlete, lines with tax per line, totals, when it was paid
 * and how (card, bank transfer or cash, with the owner's note), and a refund.
 */
export async function renderReceipt(inv: InvoiceDetail, logo: LogoImage | null = null): Promise<Buffer> {
  const doc = await newPdfDocument({ size: 'A4', margin: 56, info: { Title: `Receipt ${inv.number}`, Author: inv.clinicName } });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  const money = (m: number) => `${formatMinor(m)} ${inv.currency}`;
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  const seller = sellerLines(inv);
  const sellerWidth = width - drawLogoTopRight(doc, logo, doc.y);
  doc.font('bold').fontSize(20).fillColor(SPRUCE).text(seller.name, { width: sellerWidth });
  doc.font('regular').fontSize(10).fillColor(MUTED);
  for (const line of seller.lines) doc.text(line, { width: sellerWidth });
  doc.moveDown(0.8);
  doc.font('semibold').fontSize(14).fillColor('#000').text(`Receipt for invoice ${inv.number}`).moveDown(0.5);
  doc.font('regular').fontSize(10).fillColor(MUTED);
  doc.text(`Billed to: ${inv.athleteName}`);
  doc.text(`Issued: ${day(inv.issuedAt)}    Due: ${day(inv.dueDate)}`);
  doc.text(`Paid: ${day(inv.paidOn ?? inv.paidAt)} by ${PAID_BY[inv.paymentMethod ?? 'card']}`);
  if (inv.paymentNote) doc.text(`Payment note: ${inv.paymentNote}`);
  doc.moveDown();

  const cols = [
    { label: 'Item', x: left, w: width * 0.4, align: 'left' as const },
    { label: 'Qty', x: left + width * 0.4, w: width * 0.08, align: 'right' as const },
    { label: 'Unit', x: left + width * 0.48, w: width * 0.16, align: 'right' as const },
    { label: 'Tax', x: left + width * 0.64, w: width * 0.12, align: 'right' as const },
    { label: 'Amount', x: left + width * 0.76, w: width * 0.24, align: 'right' as const },
  ];
  const row = (cells: string[], font: string) => {
    const y = doc.y;
    doc.font(font).fontSize(10).fillColor('#000');
    let bottom = y;
    cells.forEach((c, i) => {
      const col = cols[i]!;
      doc.text(c, col.x, y, { width: col.w, align: col.align });
      bottom = Math.max(bottom, doc.y);
    });
    doc.x = left;
    doc.y = bottom + 4;
  };
  row(
    cols.map((c) => c.label),
    'semibold',
  );
  doc
    .moveTo(left, doc.y)
    .lineTo(left + width, doc.y)
    .strokeColor('#c9d4cf')
    .stroke();
  doc.y += 4;
  for (const l of inv.lines) {
    row([l.description, String(l.quantity), formatMinor(l.unitAmountMinor), rate(l.taxRateBp), money(l.totalMinor)], 'regular');
  }
  doc
    .moveTo(left, doc.y)
    .lineTo(left + width, doc.y)
    .strokeColor('#c9d4cf')
    .stroke();
  doc.y += 6;
  const total = (label: string, value: string, font: string) => {
    const y = doc.y;
    doc
      .font(font)
      .fontSize(font === 'bold' ? 12 : 10)
      .fillColor('#000');
    doc.text(label, left + width * 0.4, y, { width: width * 0.36, align: 'right' });
    doc.text(value, left + width * 0.76, y, { width: width * 0.24, align: 'right' });
    doc.x = left;
  };
  total('Subtotal', money(inv.subtotalMinor), 'regular');
  total('Tax', money(inv.taxMinor), 'regular');
  total('Total paid', money(inv.totalMinor), 'bold');
  doc.moveDown();
  if (inv.status === 'refunded') {
    const how =
      inv.paymentMethod === 'card' || inv.paymentMethod === null ? 'to the card' : `by the clinic (${PAID_BY[inv.paymentMethod]} payment)`;
    doc
      .font('bold')
      .fontSize(12)
      .fillColor('#a33a1f')
      .text(`Refunded on ${day(inv.refundedAt)} ${how}: ${money(inv.totalMinor)}`, left);
    if (inv.refundNote) doc.font('regular').fontSize(10).fillColor(MUTED).text(`Refund note: ${inv.refundNote}`, left);
    doc.moveDown(0.5);
  }
  doc
    .font('italic')
    .fontSize(9)
    .fillColor(MUTED)
    .text('Tax is computed per line and rounded half-up to the cent. Keep this receipt for your records.', left);
  doc.end();
  return done;
}
