import { HttpErrorResponse } from '@angular/common/http';
import { asHttpError, errorCode, errorMessage, fieldProblems } from './api-error';

const http = (status: number, error: unknown = null) => new HttpErrorResponse({ status, error });

describe('errorMessage', () => {
  it("uses the server's own message", () => {
    expect(errorMessage(http(409, { error: { code: 'email_taken', message: 'That e-mail is in use.' } }))).toBe('That e-mail is in use.');
  });

  it('falls back by status when the body has no message', () => {
    expect(errorMessage(http(0))).toBe("Can't reach the server. Check your connection and try again.");
    expect(errorMessage(http(503, '<html>'))).toContain('server ran into a problem');
    expect(errorMessage(http(404))).toContain('Not found');
    expect(errorMessage(new Error('boom'))).toContain('Something went wrong');
  });

  it('reads errors wrapped by a resource (kept as cause)', () => {
    const wrapped = new Error('wrapped', { cause: http(403) });
    expect(asHttpError(wrapped)?.status).toBe(403);
    expect(errorMessage(wrapped)).toBe("You don't have access to that.");
  });
});

describe('errorCode', () => {
  it('reads error.code', () => {
    expect(errorCode(http(410, { error: { code: 'token_expired', message: 'x' } }))).toBe('token_expired');
    expect(errorCode(http(500))).toBeNull();
  });
});

describe('fieldProblems', () => {
  it('reads array paths and dotted string paths', () => {
    const err = http(422, {
      error: {
        code: 'validation',
        message: 'Invalid',
        details: [
          { path: ['injuries', 0, 'when'], message: 'Use YYYY-MM' },
          { path: 'pain.1.score', message: 'Too high' },
          { path: [], message: 'Whole body problem' },
          { nonsense: true },
        ],
      },
    });
    expect(fieldProblems(err)).toEqual([
      { path: ['injuries', 0, 'when'], message: 'Use YYYY-MM' },
      { path: ['pain', 1, 'score'], message: 'Too high' },
      { path: [], message: 'Whole body problem' },
    ]);
  });

  it('gives nothing when there are no details', () => {
    expect(fieldProblems(http(422, { error: { code: 'x', message: 'y' } }))).toEqual([]);
  });
});
