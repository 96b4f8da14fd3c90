/**
 * The visit summary's download name and its Content-Disposition header. Outside reference: the
 * header grammar of RFC 6266 with the RFC 8187 `filename*` encoding, decoded back with the
 * platform's decodeURIComponent; the names are test values.
 */
import { describe, expect, it } from 'vitest';
import { contentDisposition, summaryFileName } from '../../server/summaries/summary-file-name';

describe('summaryFileName', () => {
  it('names the athlete, the document and visit, and the date; ASCII fallback without accents', () => {
    const n = summaryFileName({ athleteName: 'Zoë Łukasiewicz', what: 'Re-test comparison', date: '2026-11-24' });
    expect(n.utf8).toBe('Zoë Łukasiewicz – Re-test comparison – 2026-11-24.pdf');
    // Ł has no decomposition: it drops out of the fallback rather than becoming a wrong letter.
    expect(n.ascii).toBe('zoe-ukasiewicz-re-test-comparison-2026-11-24.pdf');
  });

  it('keeps characters no file system accepts out of the name', () => {
    const n = summaryFileName({ athleteName: 'A/B "C"', what: 'Baseline visit summary', date: '2026-10-06' });
    expect(n.utf8).toBe('A B C – Baseline visit summary – 2026-10-06.pdf');
    expect(n.ascii).toBe('a-b-c-baseline-visit-summary-2026-10-06.pdf');
    expect(summaryFileName({ athleteName: '李', what: '', date: '' }).ascii).toBe('visit-summary.pdf');
  });
});

describe('contentDisposition', () => {
  it('[RFC 6266 / RFC 8187] a quoted ASCII filename and the exact UTF-8 name in filename*', () => {
    const name = summaryFileName({ athleteName: "Zoë O'Neil", what: 'Re-test comparison', date: '2026-11-24' });
    const h = contentDisposition('attachment', name);
    const m = /^attachment; filename="([\x20-\x7e]+)"; filename\*=UTF-8''([A-Za-z0-9!#$&+\-.^_`|~%]+)$/.exec(h);
    expect(m, h).not.toBeNull();
    expect(m![1]).toBe('zoe-o-neil-re-test-comparison-2026-11-24.pdf');
    expect(decodeURIComponent(m![2]!)).toBe("Zoë O'Neil – Re-test comparison – 2026-11-24.pdf");
    expect(contentDisposition('inline', name)).toMatch(/^inline; filename="/);
  });
});
