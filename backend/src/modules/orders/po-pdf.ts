import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';

const require = createRequire(import.meta.url);
/** Lato from @fontsource (WOFF, which pdfkit's font engine reads): regular and bold, subset on embedding. */
const LATO = require.resolve('@fontsource/lato/files/lato-latin-400-normal.woff');
const LATO_BOLD = require.resolve('@fontsource/lato/files/lato-latin-700-normal.woff');

export interface PurchaseOrderDocument {
  poNumber: string;
  issuedAt: Date;
  organisationName: string;
  siteName: string;
  deliveryAddress: string;
  timeZone: string;
  supplier: { name: string; orderEmail: string; phone: string };
  lines: { description: string; sourceName: string; quantity: number; unit: string; unitPriceMinor: number; totalMinor: number }[];
  currency: string;
  windowStart: Date;
  windowEnd: Date;
  contact: { name: string; email: string };
  approvedBy: string[];
  requestReference: string;
}

function money(minor: number, currency: string): string {
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(minor / 100);
  } catch {
    return `${(minor / 100).toFixed(2)} ${currency}`;
  }
}

function when(d: Date, zone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone: zone, dateStyle: 'medium', timeStyle: 'short' }).format(d);
}

const INK = '#1c2b33';
const MUTED = '#5b6b73';
const RULE = '#c9d3d8';
const ACCENT = '#0f5d73';

/**
 * Renders a purchase order as an A4 PDF with our own layout: order number and date, supplier, delivery
 * site and address, lines with prices, total, delivery window and contact. The creation date is the
 * order's, so the same order always renders the same content.
 */
export function renderPurchaseOrderPdf(po: PurchaseOrderDocument): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: 50,
    info: {
      Title: `Purchase order ${po.poNumber}`,
      Author: po.organisationName,
      Subject: `Purchase order ${po.poNumber} to ${po.supplier.name}`,
      CreationDate: po.issuedAt,
      Producer: 'Plenum',
    },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  doc.registerFont('Lato', LATO);
  doc.registerFont('Lato-Bold', LATO_BOLD);
  const left = 50;
  const width = doc.page.width - 100;

  // Header band
  doc.rect(0, 0, doc.page.width, 8).fill(ACCENT);
  doc.fillColor(INK).font('Lato-Bold').fontSize(20).text('Purchase order', left, 40);
  doc.font('Lato-Bold').fontSize(14).fillColor(ACCENT).text(po.poNumber, left, 44, { width, align: 'right' });
  doc
    .font('Lato')
    .fontSize(9)
    .fillColor(MUTED)
    .text(`Issued ${when(po.issuedAt, po.timeZone)} · request ${po.requestReference}`, left, 64, { width, align: 'right' });
  doc.font('Lato').fontSize(10).fillColor(INK).text(po.organisationName, left, 68);

  // Supplier and delivery blocks
  const top = 105;
  const col = width / 2 - 10;
  const block = (x: number, title: string, lines: string[]) => {
    doc.font('Lato-Bold').fontSize(9).fillColor(MUTED).text(title.toUpperCase(), x, top, { width: col, characterSpacing: 0.5 });
    doc
      .font('Lato')
      .fontSize(10.5)
      .fillColor(INK)
      .text(lines.filter(Boolean).join('\n'), x, top + 14, { width: col, lineGap: 2 });
  };
  block(left, 'Supplier', [po.supplier.name, po.supplier.orderEmail, po.supplier.phone]);
  block(left + col + 20, 'Deliver to', [po.siteName, ...po.deliveryAddress.split('\n').filter((l) => l !== po.siteName)]);

  // Delivery window
  let y = top + 90;
  doc.roundedRect(left, y, width, 38, 4).fillAndStroke('#eef4f6', RULE);
  doc
    .font('Lato-Bold')
    .fontSize(9)
    .fillColor(MUTED)
    .text('DELIVERY WINDOW', left + 12, y + 7, { characterSpacing: 0.5 });
  doc
    .font('Lato')
    .fontSize(11)
    .fillColor(INK)
    .text(`${when(po.windowStart, po.timeZone)} – ${when(po.windowEnd, po.timeZone)} (${po.timeZone})`, left + 12, y + 20);
  y += 58;

  // Lines
  const cols = [
    { title: 'Item', x: left, w: 200, align: 'left' as const },
    { title: 'For', x: left + 205, w: 95, align: 'left' as const },
    { title: 'Quantity', x: left + 300, w: 70, align: 'right' as const },
    { title: 'Unit price', x: left + 372, w: 62, align: 'right' as const },
    { title: 'Amount', x: left + 436, w: width - 436, align: 'right' as const },
  ];
  doc.font('Lato-Bold').fontSize(9).fillColor(MUTED);
  for (const c of cols) doc.text(c.title.toUpperCase(), c.x, y, { width: c.w, align: c.align, characterSpacing: 0.4 });
  y += 15;
  doc
    .moveTo(left, y)
    .lineTo(left + width, y)
    .lineWidth(0.8)
    .strokeColor(RULE)
    .stroke();
  y += 7;
  let total = 0;
  doc.font('Lato').fontSize(10).fillColor(INK);
  for (const l of po.lines) {
    const qty = l.unit === 'kg' ? `${l.quantity.toLocaleString('en-GB')} kg` : `${l.quantity} cyl.`;
    const per = l.unit === 'kg' ? '/kg' : '/cyl.';
    const h = Math.max(doc.heightOfString(l.description, { width: cols[0].w }), doc.heightOfString(l.sourceName, { width: cols[1].w }));
    doc.text(l.description, cols[0].x, y, { width: cols[0].w });
    doc.text(l.sourceName, cols[1].x, y, { width: cols[1].w });
    doc.text(qty, cols[2].x, y, { width: cols[2].w, align: 'right' });
    doc.text(`${money(l.unitPriceMinor, po.currency)}${per}`, cols[3].x, y, { width: cols[3].w, align: 'right' });
    doc.text(money(l.totalMinor, po.currency), cols[4].x, y, { width: cols[4].w, align: 'right' });
    y += h + 8;
    total += l.totalMinor;
  }
  doc
    .moveTo(left, y)
    .lineTo(left + width, y)
    .lineWidth(0.8)
    .strokeColor(RULE)
    .stroke();
  y += 8;
  doc
    .font('Lato')
    .fontSize(10)
    .fillColor(MUTED)
    .text('Subtotal', left + 300, y, { width: 134, align: 'right' });
  doc.fillColor(INK).text(money(total, po.currency), cols[4].x, y, { width: cols[4].w, align: 'right' });
  y += 16;
  doc
    .font('Lato-Bold')
    .fontSize(12)
    .fillColor(INK)
    .text(`Total (${po.currency})`, left + 300, y, { width: 134, align: 'right' });
  doc.text(money(total, po.currency), cols[4].x - 20, y, { width: cols[4].w + 20, align: 'right' });
  y += 20;
  doc
    .font('Lato')
    .fontSize(8.5)
    .fillColor(MUTED)
    .text('Prices from the supplier’s price list, before any tax that applies.', left, y, { width, align: 'right' });
  y += 30;

  // Contact and approval
  doc.font('Lato-Bold').fontSize(9).fillColor(MUTED).text('CONTACT', left, y, { characterSpacing: 0.5 });
  doc
    .font('Lato')
    .fontSize(10.5)
    .fillColor(INK)
    .text(`${po.contact.name} · ${po.contact.email}`, left, y + 14);
  doc
    .font('Lato-Bold')
    .fontSize(9)
    .fillColor(MUTED)
    .text('APPROVED BY', left + col + 20, y, { characterSpacing: 0.5 });
  doc
    .font('Lato')
    .fontSize(10.5)
    .fillColor(INK)
    .text(po.approvedBy.join(', '), left + col + 20, y + 14, { width: col });
  y += 50;
  doc
    .font('Lato')
    .fontSize(9.5)
    .fillColor(INK)
    .text(
      `Please quote ${po.poNumber} on the delivery note and collect the empty cylinders that are ready. Deliver within the window above; if you cannot, tell the contact before the window opens.`,
      left,
      y,
      { width, lineGap: 2 },
    );
  doc
    .font('Lato')
    .fontSize(8)
    .fillColor(MUTED)
    .text(`${po.organisationName} · ${po.poNumber}`, left, doc.page.height - 75, { width, align: 'center', lineBreak: false });
  doc.end();
  return done;
}
