import type { DataSource } from 'typeorm';
import { v4 as uuidv4 } from 'uuid';
import { z } from 'zod';
import { collarTagUrl, plannedTagCodes, shortTagId } from '../../shared/model/collar-tag';
import { AppError } from '../core/errors';
import type { Actor } from '../records/record-writer';
import { siteForActor } from './site-access';

// pdfmake ships no types; this is the small part of its server API used here.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfmake = require('pdfmake') as {
  setFonts(f: unknown): void;
  setUrlAccessPolicy(cb: (url: string) => boolean): void;
  setLocalAccessPolicy(cb: (path: string) => boolean): void;
  createPdf(doc: unknown): { getBuffer(): Promise<Buffer> };
};
// The PDF standard fonts need no font files; nothing is fetched from disk or network.
const STANDARD_FONTS = ['Helvetica', 'Helvetica-Bold', 'Helvetica-Oblique', 'Helvetica-BoldOblique'];
pdfmake.setFonts({
  Helvetica: { normal: 'Helvetica', bold: 'Helvetica-Bold', italics: 'Helvetica-Oblique', bolditalics: 'Helvetica-BoldOblique' },
});
pdfmake.setUrlAccessPolicy(() => false);
// Only the names of the PDF standard fonts pass; no other local file is read.
pdfmake.setLocalAccessPolicy((p) => STANDARD_FONTS.includes(p));

export const tagQuerySchema = z.object({
  paper: z.enum(['a4', 'letter'], { message: 'paper must be a4 or letter' }).default('a4'),
  plotId: z.string().uuid('plotId must be a UUID').optional(),
  includeRetired: z.enum(['true', 'false'], { message: 'includeRetired must be true or false' }).default('false'),
});
export type TagQuery = z.infer<typeof tagQuerySchema>;

/** Codes a blank tag may carry: short, printable, no spaces (they are painted on collars too). */
const CODE_PREFIX = /^[A-Za-z0-9][A-Za-z0-9_.-]{0,11}$/;
export const blankTagQuerySchema = z
  .object({
    paper: tagQuerySchema.shape.paper,
    count: z.coerce
      .number({ message: 'count must be a number' })
      .int('count must be a whole number')
      .min(1, 'count must be at least 1')
      .max(500, 'At most 500 tags per sheet')
      .default(21),
    codePrefix: z
      .string()
      .trim()
      .regex(CODE_PREFIX, 'codePrefix: up to 12 letters, digits, "-", "_" or ".", starting with a letter or digit')
      .optional(),
    firstNumber: z.coerce
      .number({ message: 'firstNumber must be a number' })
      .int('firstNumber must be a whole number')
      .min(0, 'firstNumber must be 0 or more')
      .max(999_999, 'firstNumber must be below 1 000 000')
      .optional(),
    /** Zero-padding of the running number: digits=2 gives C09, C10, … */
    digits: z.coerce
      .number({ message: 'digits must be a number' })
      .int('digits must be a whole number')
      .min(1, 'digits must be 1 to 6')
      .max(6, 'digits must be 1 to 6')
      .optional(),
  })
  .refine((q) => q.firstNumber === undefined || q.codePrefix !== undefined, {
    message: 'firstNumber needs a codePrefix',
    path: ['firstNumber'],
  })
  .refine((q) => q.digits === undefined || q.codePrefix !== undefined, {
    message: 'digits needs a codePrefix',
    path: ['digits'],
  });
export type BlankTagQuery = z.infer<typeof blankTagQuerySchema>;

// Measured: pdfmake draws each QR module as a vector rect, ~25 ms a tag on a busy 2-core machine
// (3000 tags: 76 s). 500 tags keep one request near 12 s; larger sites print a plot at a time.
export const MAX_TAGS = 500;
const MM = 72 / 25.4;
/** 3 × 7 tags of 63.5 × 37.4 mm (the usual 21-up weatherproof label sheet) fit both A4 and Letter. */
const COLS = 3;
const ROWS = 7;
const TAG_W = 63.5 * MM;
const TAG_H = 106; // pt, ≈ 37.4 mm: leaves room for the cut lines on Letter's shorter page
const QR_PT = 88; // ≈ 31 mm: large enough to scan from arm's length through a scratched laminate
/** QR needs a light margin of 4 modules (ISO/IEC 18004); a ~75-character address is version 5 at level M, 37 modules in 88 pt → ≥ 9.5 pt. */
const QUIET = 11;
const PAPER = { a4: { size: 'A4', w: 595.28, h: 841.89 }, letter: { size: 'LETTER', w: 612, h: 792 } } as const;

// What a tag's QR code holds is defined once in shared/, where Walk reads it back.
export { collarTagUrl } from '../../shared/model/collar-tag';

/** One tag: a collar that exists (with its plot), or a blank tag for a new collar (plotCode null). */
export interface TagCollar {
  id: string;
  code: string;
  plotCode: string | null;
}

function tagCell(c: TagCollar, siteName: string, origin: string) {
  const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);
  const blank = c.plotCode === null;
  const url = blank ? collarTagUrl(origin, c.id, c.code || null) : collarTagUrl(origin, c.id);
  const codeLine =
    blank && !c.code
      ? { text: 'Code: ________', bold: true, fontSize: 11 }
      : { text: clip(c.code, 24), bold: true, fontSize: c.code.length <= 8 ? 15 : 10 };
  return {
    columns: [
      { qr: url, fit: QR_PT, eccLevel: 'M', margin: [QUIET, 8, 0, 0], width: QR_PT + QUIET },
      {
        width: '*',
        margin: [QUIET, 10, 4, 0],
        stack: [
          codeLine,
          { text: blank ? `New collar · tag ${shortTagId(c.id)}` : `Plot ${clip(c.plotCode!, 20)}`, fontSize: 9, margin: [0, 4, 0, 0] },
          { text: clip(siteName, 60), fontSize: 7, color: '#333333', margin: [0, 4, 0, 0] },
        ],
      },
    ],
  };
}

/** The tag sheet as a PDF: one page per 21 tags, a dashed cut grid, text as text (never markup). */
export async function renderTagSheet(collars: TagCollar[], siteName: string, paper: 'a4' | 'letter', origin: string): Promise<Buffer> {
  const p = PAPER[paper];
  const marginX = (p.w - COLS * TAG_W) / 2;
  const marginY = (p.h - ROWS * TAG_H) / 2 - 2;
  const pages: unknown[] = [];
  for (let i = 0; i < collars.length; i += COLS * ROWS) {
    const chunk = collars.slice(i, i + COLS * ROWS);
    const body: unknown[][] = [];
    for (let r = 0; r < chunk.length; r += COLS) {
      const row = chunk.slice(r, r + COLS).map((c) => tagCell(c, siteName, origin));
      while (row.length < COLS) row.push({ text: '' } as never);
      body.push(row);
    }
    pages.push({
      table: { widths: Array(COLS).fill(TAG_W - 1), heights: TAG_H - 1, body, dontBreakRows: true },
      layout: {
        hLineWidth: () => 0.3,
        vLineWidth: () => 0.3,
        hLineColor: () => '#999999',
        vLineColor: () => '#999999',
        hLineStyle: () => ({ dash: { length: 3, space: 3 } }),
        vLineStyle: () => ({ dash: { length: 3, space: 3 } }),
        paddingLeft: () => 0,
        paddingRight: () => 0,
        paddingTop: () => 0,
        paddingBottom: () => 0,
      },
      pageBreak: i + COLS * ROWS < collars.length ? 'after' : undefined,
    });
  }
  const doc = {
    pageSize: p.size,
    pageMargins: [marginX, marginY, marginX, 0],
    info: { title: `Collar tags · ${siteName}`, creator: 'Fluxwalk' },
    defaultStyle: { font: 'Helvetica' },
    content: pages.length ? pages : [{ text: 'No collars to tag at this site.' }],
  };
  return pdfmake.createPdf(doc).getBuffer();
}

/** The collars of a site (or one plot) in plot, then code order, for the tag sheet. */
export async function collarTagSheet(ds: DataSource, actor: Actor, siteId: string, q: TagQuery, origin: string) {
  const site = await siteForActor(ds, actor, siteId);
  const collars: TagCollar[] = await ds.query(
    `SELECT c.id, c.code, p.code AS "plotCode" FROM collar c JOIN plot p ON p.id = c.plot_id
      WHERE c.site_id = $1 AND NOT c.deleted AND ($2::uuid IS NULL OR c.plot_id = $2)
        AND ($3 OR c.status <> 'retired')
      ORDER BY p.code, c.code LIMIT ${MAX_TAGS + 1}`,
    [siteId, q.plotId ?? null, q.includeRetired === 'true'],
  );
  if (collars.length > MAX_TAGS) throw new AppError(400, `At most ${MAX_TAGS} tags per sheet: choose one plot at a time`);
  return { pdf: await renderTagSheet(collars, site.name, q.paper, origin), count: collars.length, siteName: site.name };
}

/**
 * Tags for collars not installed yet: each holds a fresh collar id that the collar takes when the
 * crew scans the tag on the install screen, and, when a code prefix is given, the planned code
 * (prefix + running number, zero-padded to `digits`). Planned codes already used at the site are refused, naming them.
 * Nothing is stored: an unused tag costs nothing, and ids are random so they never collide.
 */
export async function blankTagSheet(ds: DataSource, actor: Actor, siteId: string, q: BlankTagQuery, origin: string) {
  const site = await siteForActor(ds, actor, siteId);
  const first = q.firstNumber ?? 1;
  const codes = q.codePrefix ? plannedTagCodes(q.codePrefix, first, q.digits ?? 1, q.count) : Array<string>(q.count).fill('');
  if (q.codePrefix) {
    const taken: { code: string }[] = await ds.query(
      `SELECT code FROM collar WHERE site_id = $1 AND NOT deleted AND code = ANY($2::text[]) ORDER BY code LIMIT 6`,
      [siteId, codes],
    );
    if (taken.length) {
      const names =
        taken
          .slice(0, 5)
          .map((t) => t.code)
          .join(', ') + (taken.length > 5 ? ', …' : '');
      throw new AppError(409, `These codes are already used at this site: ${names}. Choose another prefix or first number.`);
    }
  }
  const tags: TagCollar[] = codes.map((code) => ({ id: uuidv4(), code, plotCode: null }));
  return { pdf: await renderTagSheet(tags, site.name, q.paper, origin), count: tags.length, siteName: site.name };
}
