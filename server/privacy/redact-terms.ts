/**
 * Rewrites every occurrence of an erased athlete's identifying terms (full name, first name, last
 * name, e-mail, phone) in free text typed by staff — kept invoices' notes and line descriptions —
 * to the erasure reference. Pure: text in, text out.
 */

/** What identifies the athlete in text; empty or missing terms are ignored. */
export interface IdentifyingTerms {
  firstName: string;
  lastName: string;
  email?: string | null;
  phone?: string | null;
}

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
/** Not inside a longer word: "Ada" is the name in "for Ada," but not in "Adagio". */
const word = (pattern: string) => `(?<![\\p{L}\\p{N}])${pattern}(?![\\p{L}\\p{N}])`;

/**
 * A matcher of the terms, longest first (the full name is one occurrence, not two): names as whole
 * words with any spacing and case, the e-mail in any case, the phone with any spaces, dots, dashes
 * or brackets between its digits. Null when there is nothing to look for.
 */
export function identifyingPattern(terms: IdentifyingTerms): RegExp | null {
  const names = [terms.firstName, terms.lastName].map((n) => n.trim()).filter(Boolean);
  const parts: string[] = [];
  if (names.length === 2) parts.push(word(names.map((n) => n.split(/\s+/).map(escape).join('\\s+')).join('\\s+')));
  const email = terms.email?.trim();
  if (email) parts.push(escape(email));
  const digits = (terms.phone ?? '').replace(/\D/g, '');
  // Fewer digits than a phone number would match amounts and dates.
  if (digits.length >= 6) parts.push(`(?<!\\d)\\+?${digits.split('').join('[\\s.\\-()]*')}(?!\\d)`);
  for (const n of [...names].sort((a, b) => b.length - a.length)) parts.push(word(n.split(/\s+/).map(escape).join('\\s+')));
  return parts.length ? new RegExp(parts.join('|'), 'giu') : null;
}

/** `text` with every occurrence of the terms replaced by `reference` (null stays null). */
export function redactTerms(text: string | null, terms: IdentifyingTerms, reference: string): string | null {
  const pattern = identifyingPattern(terms);
  return text === null || pattern === null ? text : text.replace(pattern, reference);
}
