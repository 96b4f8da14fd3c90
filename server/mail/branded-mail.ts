/**
 * The clinic's letterhead on an e-mail: its logo (an inline image, `cid:clinic-logo`) and name at
 * the top of an HTML part, and its legal details as a footer of both parts. Pure: message in,
 * nodemailer fields out.
 */
import type { BrandForDocuments } from '../clinic/clinic-brand';

/** The content id of the inline logo. */
export const LOGO_CID = 'clinic-logo@trailframe';

/** What nodemailer sends for a branded message. */
export interface BrandedFields {
  text: string;
  html: string;
  attachments: { filename: string; content: Buffer; contentType: string; cid: string }[];
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The footer lines: legal name, address on one line, tax number, contact line (those given). */
export function legalFooter(brand: BrandForDocuments): string[] {
  const l = brand.legal;
  return [
    l.legalName || brand.name,
    l.address.split('\n').filter(Boolean).join(', '),
    l.taxNumber ? `Tax number ${l.taxNumber}` : '',
    l.contactLine,
  ].filter(Boolean);
}

/** Text with the footer, and an HTML part with the logo on top (links in the text become links). */
export function brandedFields(text: string, brand: BrandForDocuments): BrandedFields {
  const footer = legalFooter(brand);
  const logoHeight = 48;
  const logoWidth = brand.logo && brand.logo.height > 0 ? Math.round((brand.logo.width / brand.logo.height) * logoHeight) : 0;
  const head = brand.logo
    ? `<p><img src="cid:${LOGO_CID}" alt="${escapeHtml(brand.name)}" width="${logoWidth}" height="${logoHeight}" style="display:block"></p>`
    : `<p style="font-weight:bold">${escapeHtml(brand.name)}</p>`;
  const body = text
    .split('\n\n')
    .map(
      (para) =>
        `<p>${escapeHtml(para)
          .replace(/\n/g, '<br>')
          .replace(/(https?:\/\/[^\s<]+)/g, '<a href="$1">$1</a>')}</p>`,
    )
    .join('\n');
  const foot = `<p style="color:#555;font-size:12px;border-top:1px solid #ccc;padding-top:8px">${footer.map(escapeHtml).join('<br>')}</p>`;
  return {
    text: `${text}\n\n--\n${footer.join('\n')}`,
    html: `<!doctype html><html><body style="font-family:sans-serif">${head}\n${body}\n${foot}</body></html>`,
    attachments: brand.logo ? [{ filename: 'logo.png', content: brand.logo.png, contentType: 'image/png', cid: LOGO_CID }] : [],
  };
}
