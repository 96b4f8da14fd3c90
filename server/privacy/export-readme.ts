import { ATHLETE_TABLES, ATHLETE_TABLE_NAMES } from './athlete-tables';

/** A file the export could not find in storage (listed in the README instead). */
export interface MissingFile {
  name: string;
  why: string;
}

/** The README.txt inside an export zip: what each file is. */
export function exportReadme(o: { clinicName: string; exportedAt: string; athleteId: number; missing: readonly MissingFile[] }): string {
  const tables = ATHLETE_TABLE_NAMES.map((t) => `  - ${t}: ${ATHLETE_TABLES[t].about}`).join('\n');
  const missing = o.missing.length
    ? `\nFiles that could not be included (not in storage any more):\n${o.missing.map((m) => `  - ${m.name}: ${m.why}`).join('\n')}\n`
    : '';
  return `Everything ${o.clinicName} holds about you in Trailframe
Exported ${o.exportedAt} (athlete record ${o.athleteId}).

data.json
  Every stored row about you, machine-readable (JSON, UTF-8). "tables" holds one list of rows per
  table, with the columns as stored (times in ISO 8601 UTC; distances in kilometres; speeds in metres
  per second; marks as fractions of the frame's width and height). Passwords and link tokens are
  never exported. The tables:
${tables}

clips/
  The original clips as they were uploaded, named "<clip id>-<original file name>".
stills/published/ and stills/unpublished/
  Annotated stills (PNG), shared with you or not yet shared.
summaries/published/ and summaries/unpublished/
  Visit summaries (PDF).
annotated-clips/published/ and annotated-clips/unpublished/
  Annotated slow-motion and side-by-side clips (MP4).
receipts/
  Receipts of paid invoices (PDF).
${missing}
Measures are estimates from video and marks placed by hand; read them with your clinician.
`;
}
