import { HttpErrorResponse } from '@angular/common/http';
import { tokenProblem } from './token-problem';

const http = (status: number, code?: string) => new HttpErrorResponse({ status, error: code ? { error: { code, message: 'x' } } : null });

describe('tokenProblem', () => {
  it('explains expired and used links by their error code', () => {
    expect(tokenProblem(http(410, 'token_expired'), 'invitation')).toContain('expired');
    expect(tokenProblem(http(410, 'token_used'), 'reset')).toContain('already been used');
  });

  it('explains unknown links', () => {
    expect(tokenProblem(http(404), 'reset')).toContain("don't recognise");
  });

  it('falls back to the general message', () => {
    expect(tokenProblem(http(0), 'invitation')).toContain("Can't reach the server");
  });
});
