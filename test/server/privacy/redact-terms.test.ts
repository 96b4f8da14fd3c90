/**
 * What erasure rewrites in the free text of kept invoices (`server/privacy/redact-terms.ts`): worked
 * examples written out by hand — the full name is one occurrence; names only as whole words in any
 * case or spacing; the e-mail in any case; a phone number however its digits are grouped.
 */
import { describe, expect, it } from 'vitest';
import { identifyingPattern, redactTerms } from '../../../server/privacy/redact-terms';

const terms = { firstName: 'Ada', lastName: 'Kestrel', email: 'ada.kestrel@runner.test', phone: '+44 7700 900123' };
const REF = 'E-1A2B';

describe('redactTerms', () => {
  it('replaces the full name once, and each name, e-mail and phone wherever they stand', () => {
    expect(redactTerms('Sessions for Ada Kestrel (ADA.Kestrel@runner.test), call 07700-900-123 or +44 (7700) 900.123', terms, REF)).toBe(
      'Sessions for E-1A2B (E-1A2B), call 07700-900-123 or E-1A2B',
    );
    expect(redactTerms('Kestrel, Ada; ada  KESTREL; paid by ada', terms, REF)).toBe('E-1A2B, E-1A2B; E-1A2B; paid by E-1A2B');
  });

  it('leaves words that merely contain a name, amounts and dates, and null, as they are', () => {
    const text = 'Adagio drills, Kestrels club; 12.50 GBP on 2026-11-30';
    expect(redactTerms(text, terms, REF)).toBe(text);
    expect(redactTerms(null, terms, REF)).toBeNull();
  });

  it('reads names with letters outside basic Latin and regex signs literally', () => {
    expect(redactTerms('Note: Zoë Ó Briain (Zoë)', { firstName: 'Zoë', lastName: 'Ó Briain' }, REF)).toBe('Note: E-1A2B (E-1A2B)');
    expect(redactTerms('A.B. and AxB', { firstName: 'A.B.', lastName: '' }, REF)).toBe('E-1A2B and AxB');
  });

  it('has nothing to look for without any term', () => {
    expect(identifyingPattern({ firstName: ' ', lastName: '', email: null, phone: '12' })).toBeNull();
  });
});
