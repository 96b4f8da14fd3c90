/**
 * Demonstration pictures of exercises and the clinic's logo through the API: processing (upright,
 * metadata-free — read back with exifr; sizes read with image-size), order and captions, who sees
 * them (an athlete only for exercises of their own plans; another clinic's 404), bad uploads
 * refused with a clear 4xx leaving no row and no file, and the logo on receipts and visit-summary
 * PDFs (image count read with pdf-parse) and in e-mails (the HTML part as the fake SMTP receiver
 * parsed it with mailparser).
 */
import exifr from 'exifr';
import { imageSize } from 'image-size';
import { Jimp } from 'jimp';
import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { OTHER, signedIn, makeTestApp, type Client, type TestApp } from '../support/test-app';
import { storedExerciseFiles, uploadFile } from '../support/demonstrations';
import { startPlanWith } from '../support/plans';
import { gifBomb, jpegDeclaring, markedJpeg, withExif } from '../support/pictures';
import type { DemoPicture } from '../../src/contracts/demonstrations';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let o: Client;
let c: Client;
let a: Client;
let other: Client;
/** An exercise on Ada's running plan, and one on no plan of hers. */
let planned: number;
let unplanned: number;

const bytesOf = (res: { body: unknown }) => res.body as Buffer;
const binary = (client: Client, url: string) => client.binary(url);

const upload = (client: Client, exerciseId: number, file: Buffer, name = 'photo.jpg', caption?: string) =>
  uploadFile(client, `/api/exercises/${exerciseId}/demo-pictures`, file, name, caption);
const storedFiles = () => storedExerciseFiles(t.store);

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: true, fakePayments: true });
  o = await signedIn(t.app, owner.email, owner.password);
  c = await signedIn(t.app, coach.email, coach.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const [e1, e2] = (await c.get('/api/exercises')).body.exercises;
  planned = e1.id;
  unplanned = e2.id;
  await startPlanWith(c, ada.id, e1);
});
afterAll(async () => {
  await t.close();
});

describe('demonstration pictures', () => {
  let first: DemoPicture;

  it('a coach adds a phone photo (EXIF orientation 6, GPS): 201, upright, long side within 1600, thumbnail 400, no metadata left', async () => {
    const before = (await storedFiles()).length;
    const photo = withExif(await markedJpeg(2000, 1500), 6);
    const res = await upload(c, planned, photo, 'IMG_0001.JPG', 'Start: heels over the edge');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    first = res.body;
    expect(first).toMatchObject({ exerciseId: planned, position: 0, caption: 'Start: heels over the edge', width: 1200, height: 1600 });
    const full = bytesOf(await binary(c, first.url));
    const thumb = bytesOf(await binary(c, first.thumbUrl));
    expect(imageSize(full)).toMatchObject({ width: 1200, height: 1600, type: 'jpg' });
    expect(imageSize(thumb)).toMatchObject({ width: 300, height: 400, type: 'jpg' });
    // The stored top-left mark is at the top-right once upright (EXIF orientation 6; from memory).
    const img = await Jimp.fromBuffer(full);
    const px = (x: number, y: number) => (img.getPixelColor(x, y) >>> 24) & 255;
    expect(px(1200 - 15, 15)).toBeGreaterThan(200);
    expect(px(15, 15)).toBeLessThan(160);
    for (const bytes of [full, thumb]) {
      expect(await exifr.parse(bytes, { tiff: true, gps: true, xmp: true, iptc: true, mergeOutput: false })).toBeUndefined();
    }
    expect((await storedFiles()).length).toBe(before + 2);
  }, 90_000);

  it('keeps the order and the captions; a picture moves to another place', async () => {
    const second = (await upload(c, planned, await markedJpeg(640, 480), 'b.png')).body as DemoPicture;
    expect(second.position).toBe(1);
    const moved = await c.patch(`/api/demo-pictures/${second.id}`, { position: 0, caption: 'Lower slowly' });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    const list = (await c.get(`/api/exercises/${planned}/demonstrations`)).body.pictures as DemoPicture[];
    expect(list.map((p) => [p.id, p.position, p.caption])).toEqual([
      [second.id, 0, 'Lower slowly'],
      [first.id, 1, 'Start: heels over the edge'],
    ]);
    expect((await c.patch(`/api/demo-pictures/${second.id}`, { caption: 'two\nlines' })).status).toBe(422);
  });

  it('the athlete sees the pictures of an exercise on their plan, not of others; another clinic gets 404', async () => {
    const mine = await a.get(`/api/exercises/${planned}/demonstrations`);
    expect(mine.status).toBe(200);
    expect(mine.body.pictures).toHaveLength(2);
    expect((await binary(a, first.url)).status).toBe(200);
    const pic = (await upload(c, unplanned, await markedJpeg(300, 200))).body as DemoPicture;
    expect((await a.get(`/api/exercises/${unplanned}/demonstrations`)).status).toBe(404);
    expect((await a.get(pic.url)).status).toBe(404);
    expect((await other.get(`/api/exercises/${planned}/demonstrations`)).status).toBe(404);
    expect((await other.get(first.url)).status).toBe(404);
    expect((await other.patch(`/api/demo-pictures/${first.id}`, { caption: 'x' })).status).toBe(404);
    expect((await upload(other, planned, await markedJpeg(300, 200))).status).toBe(404);
    expect((await a.patch(`/api/demo-pictures/${first.id}`, { caption: 'x' })).status).toBe(403);
  });

  it.each([
    ['a text file named .jpg', async () => Buffer.from('not a picture at all\n'), 422, 'not_picture'],
    ['a truncated JPEG', async () => (await markedJpeg(400, 300)).subarray(0, 3000), 422, 'truncated'],
    ['a 60-megapixel picture (header)', async () => jpegDeclaring(await markedJpeg(64, 48), 10000, 6000), 422, 'too_many_pixels'],
    ['a GIF bomb', async () => gifBomb(), 422, 'too_many_pixels'],
    ['an SVG', async () => Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"><script>x()</script></svg>'), 422, 'svg_refused'],
  ])('%s is refused with a clear 4xx and leaves no row and no file', async (_what, make, status, code) => {
    const rows = await t.db('demo_pictures').count({ n: '*' }).first();
    const files = await storedFiles();
    const res = await upload(c, unplanned, await make(), 'upload.jpg');
    expect(res.status, JSON.stringify(res.body)).toBe(status);
    expect(res.body.error).toMatchObject({ code, message: expect.stringMatching(/\w/) });
    expect(await t.db('demo_pictures').count({ n: '*' }).first()).toEqual(rows);
    expect(await storedFiles()).toEqual(files);
  });

  it('an upload without a file, or a JSON body, is 422 / 400; a fifth picture 409', async () => {
    const none = await c.agent
      .post(`/api/exercises/${unplanned}/demo-pictures`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .field('caption', 'no file');
    expect(none.status).toBe(422);
    expect((await c.post(`/api/exercises/${unplanned}/demo-pictures`, { file: 'x' })).status).toBe(400);
    for (let i = 0; i < 3; i++) expect((await upload(c, unplanned, await markedJpeg(200, 150))).status).toBe(201);
    const fifth = await upload(c, unplanned, await markedJpeg(200, 150));
    expect(fifth.status).toBe(409);
    expect(fifth.body.error.code).toBe('demo_pictures_full');
  }, 90_000);

  it('removing a picture removes its files and closes the gap in the order', async () => {
    const list = (await c.get(`/api/exercises/${planned}/demonstrations`)).body.pictures as DemoPicture[];
    const files = (await storedFiles()).length;
    expect((await c.delete(`/api/demo-pictures/${list[0]!.id}`)).status).toBe(204);
    expect((await storedFiles()).length).toBe(files - 2);
    const left = (await c.get(`/api/exercises/${planned}/demonstrations`)).body.pictures as DemoPicture[];
    expect(left.map((p) => p.position)).toEqual([0]);
    expect((await c.get(list[0]!.url)).status).toBe(404);
  });
});

describe('clinic logo and legal details on documents', () => {
  /** A 900×300 PNG: transparent, with an opaque spruce bar in the middle. */
  async function logoPng(): Promise<Buffer> {
    const img = new Jimp({ width: 900, height: 300, color: 0x00000000 });
    for (let y = 100; y < 200; y++) for (let x = 100; x < 800; x++) img.setPixelColor(0x1f5a4aff, x, y);
    return img.getBuffer('image/png');
  }

  async function putLogo(client: Client, file: Buffer, name = 'logo.png') {
    return client.agent
      .put('/api/clinic/logo')
      .set('X-XSRF-TOKEN', await client.xsrf())
      .attach('file', file, name);
  }

  const imageCount = async (pdf: Buffer) =>
    (await new PDFParse({ data: new Uint8Array(pdf) }).getImage({ imageThreshold: 0 })).pages.reduce((n, p) => n + p.images.length, 0);

  it('the owner uploads a logo: kept as a PNG with its transparency, 600 px wide; everyone of the clinic reads the brand', async () => {
    expect((await putLogo(c, await logoPng())).status).toBe(403);
    expect((await putLogo(o, Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'), 'logo.svg')).status).toBe(422);
    const res = await putLogo(o, await logoPng());
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.logoUrl).toMatch(/^\/api\/clinic\/logo\.png\?v=\d+$/);
    const brand = await a.get('/api/clinic/brand');
    expect(brand.status).toBe(200);
    expect(brand.body.logoUrl).toBe(res.body.logoUrl);
    const png = bytesOf(await binary(a, res.body.logoUrl));
    expect(imageSize(png)).toMatchObject({ width: 600, height: 200, type: 'png' });
    const img = await Jimp.fromBuffer(png);
    expect(img.getPixelColor(10, 10) & 255).toBe(0); // transparent corner
    expect(img.getPixelColor(300, 100) & 255).toBe(255); // opaque bar
    expect((await other.get('/api/clinic/brand')).body.logoUrl).toBeNull();
  });

  it('the receipt PDF carries the logo (one image) beside the legal details', async () => {
    await o.put('/api/clinic/legal-details', {
      legalName: 'Larchwood Running Clinic Ltd',
      address: '4 Birch Row\nLarchwood',
      taxNumber: 'LW 778 210',
      contactLine: 'desk@larchwood-clinic.test',
    });
    const ada = await t.db('athletes').where({ email: athlete.email }).first();
    const price = (await o.get('/api/prices')).body.prices[0];
    const draft = await o.post('/api/invoices', {
      athleteId: ada.id,
      assessmentId: null,
      dueDate: new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10),
      note: null,
      lines: [{ priceId: price.id, description: price.item, quantity: 1, unitAmountMinor: price.amountMinor, taxRateBp: price.taxRateBp }],
    });
    expect(draft.status, JSON.stringify(draft.body)).toBe(201);
    const issued = await o.post(`/api/invoices/${draft.body.id}/issue`);
    expect(issued.body.clinicLogoUrl).toMatch(/logo\.png/);
    const paid = await o.post(`/api/invoices/${draft.body.id}/payments`, {
      method: 'cash',
      paidOn: new Date().toISOString().slice(0, 10),
      note: '',
    });
    expect(paid.status, JSON.stringify(paid.body)).toBe(200);
    const receipt = await binary(a, `/api/invoices/${draft.body.id}/receipt`);
    expect(receipt.status, String(receipt.body)).toBe(200);
    const pdf = bytesOf(receipt);
    expect(await imageCount(pdf)).toBe(1);
    const text = (await new PDFParse({ data: new Uint8Array(pdf) }).getText()).text;
    expect(text).toContain('Larchwood Running Clinic Ltd');
    expect(text).toContain('LW 778 210');

    // The invoice e-mail went out with the logo inline and the legal details in the footer.
    const mail = await t
      .db('mailbox_messages')
      .where('subject', 'like', 'Invoice %')
      .orderBy('id', 'desc')
      .first<{ html: string | null; text: string }>();
    expect(mail.text).toContain('Tax number LW 778 210');
    const src = mail.html?.match(/<img src="(data:image\/png;base64,[^"]+)"/)?.[1];
    expect(src, mail.html ?? 'no html').toBeTruthy();
    const inlined = await Jimp.fromBuffer(Buffer.from(src!.split(',')[1]!, 'base64'));
    expect([inlined.width, inlined.height]).toEqual([600, 200]);
    expect(inlined.getPixelColor(10, 10) & 255).toBe(0);
  });
});
