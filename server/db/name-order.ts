/**
 * Alphabetical order of the names and labels people read in lists, the same on both databases:
 * SQLite's `ORDER BY` compares bytes ("Zed" before "ankle", "Ångström" after "Z") and PostgreSQL's
 * follows the database's collation, so such lists are sorted with this instead (Unicode collation,
 * English; case and accents second; digits as numbers: "Room 9" before "Room 10").
 */
export const byName: (a: string, b: string) => number = new Intl.Collator('en', { numeric: true }).compare;
