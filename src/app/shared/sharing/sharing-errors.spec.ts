import { HttpErrorResponse } from '@angular/common/http';
import { describe, expect, it } from 'vitest';
import { saveProblems } from './sharing-errors';

const http = (status: number, error: unknown) => new HttpErrorResponse({ status, error });

describe('saveProblems', () => {
  it('puts a details entry under its field', () => {
    const err = http(422, {
      error: { code: 'validation', message: 'Check the fields', details: [{ path: ['caption'], message: 'At most 280 characters' }] },
    });
    expect(saveProblems(err, ['caption'])).toEqual({ byField: { caption: 'At most 280 characters' }, general: null });
  });
  it('reads a fields object too', () => {
    const err = http(422, { error: { code: 'validation', message: 'Check the fields', fields: { findings: 'Too long' } } });
    expect(saveProblems(err, ['findings', 'planText'])).toEqual({ byField: { findings: 'Too long' }, general: null });
  });
  it('gives the server message for other problems (a deleted clip)', () => {
    const err = http(404, { error: { code: 'not_found', message: 'The clip was deleted.' } });
    expect(saveProblems(err, ['caption'])).toEqual({ byField: {}, general: 'The clip was deleted.' });
  });
  it('lists problems of unknown fields as general', () => {
    const err = http(422, { error: { code: 'validation', message: 'x', details: [{ path: 'stillIds.0', message: 'Unknown still' }] } });
    expect(saveProblems(err, ['caption'])).toEqual({ byField: {}, general: 'Unknown still' });
  });
});
