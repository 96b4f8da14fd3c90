import { madeClipId, parseBody, shouldRetry, uploadHttpError, type UploadFailure } from './tus-answers';

/** A failure with the server's answer (status and body), as tus-js-client reports it. */
const answered = (status: number, body = ''): UploadFailure => ({
  message: `tus: unexpected response, status ${status}`,
  originalResponse: { getStatus: () => status, getBody: () => body },
});
const errorBody = (code: string, message = 'Refused.') => JSON.stringify({ error: { code, message } });

describe('tus answers', () => {
  it('retries a lost connection, a server error and a busy upload', () => {
    expect(shouldRetry({ message: 'tus: failed to upload chunk', originalResponse: null })).toBe(true);
    expect(shouldRetry(answered(0))).toBe(true);
    expect(shouldRetry(answered(502))).toBe(true);
    expect(shouldRetry(answered(423, errorBody('upload_locked')))).toBe(true);
  });

  it('retries an offset the server does not hold (it asks for the offset first), but not a refusal', () => {
    expect(shouldRetry(answered(409, errorBody('upload_offset_mismatch')))).toBe(true);
    expect(shouldRetry(answered(409, errorBody('consent_required')))).toBe(false);
    for (const status of [400, 403, 404, 410, 412, 413, 422]) expect(shouldRetry(answered(status, errorBody('x')))).toBe(false);
  });

  it('reads the clip a complete upload became from HEAD (Trailframe-Clip-Id), or none', () => {
    const head = (value: string | undefined) => ({ getHeader: (name: string) => (name === 'Trailframe-Clip-Id' ? value : undefined) });
    expect(madeClipId(head('42'))).toBe(42);
    for (const value of [undefined, '', '0', '-3', '4.5', 'abc']) expect(madeClipId(head(value)), String(value)).toBeNull();
  });

  it("turns the failure into the HttpErrorResponse the upload rows read, with the server's body", () => {
    const refused = uploadHttpError(answered(422, errorBody('not_video', 'This file is not a video we can read.')));
    expect(refused.status).toBe(422);
    expect(refused.error).toEqual({ error: { code: 'not_video', message: 'This file is not a video we can read.' } });
    const lost = uploadHttpError({ message: 'tus: failed to upload chunk', originalResponse: null });
    expect(lost.status).toBe(0);
    expect(lost.error).toBeNull();
    expect(parseBody('not json')).toBeNull();
  });
});
