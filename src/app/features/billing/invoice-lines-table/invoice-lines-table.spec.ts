import { TestBed } from '@angular/core/testing';
import { DRAFT_INVOICE, retestLine } from '../../../shared/testing/billing-fixtures';
import { InvoiceLinesTable } from './invoice-lines-table';

describe('InvoiceLinesTable text direction', () => {
  it('shows each line description in the direction of its own text (dir="auto"): a Hebrew line reads right to left', async () => {
    const fixture = TestBed.createComponent(InvoiceLinesTable);
    fixture.componentRef.setInput('invoice', {
      ...DRAFT_INVOICE,
      lines: [{ ...retestLine(1), description: 'בדיקה חוזרת' }, retestLine(2)],
    });
    await fixture.whenStable();
    const cells = [...(fixture.nativeElement as HTMLElement).querySelectorAll('td.item [dir="auto"]')];
    expect(cells.map((c) => c.textContent?.trim())).toEqual(['בדיקה חוזרת', 'Re-test']);
  });
});
