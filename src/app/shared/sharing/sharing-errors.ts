import { asHttpError, errorMessage, fieldProblems } from '../../core/api-error';

/**
 * Messages of a failed save, by field, for the dialogs: a 422's `details` ([{ path, message }])
 * or `fields` ({ name: message }) land under their field; everything else is a general problem.
 * The dialogs keep what the user typed either way.
 */
export function saveProblems(err: unknown, fields: readonly string[]): { byField: Record<string, string>; general: string | null } {
  const byField: Record<string, string> = {};
  const rest: string[] = [];
  const add = (path: readonly (string | number)[], message: string) => {
    const name = String(path[0] ?? '');
    if (fields.includes(name) && !byField[name]) byField[name] = message;
    else rest.push(message);
  };
  for (const p of fieldProblems(err)) add(p.path, p.message);
  const body = asHttpError(err)?.error as { error?: { fields?: unknown } } | null | undefined;
  const extra = body?.error?.fields;
  if (extra && typeof extra === 'object' && !Array.isArray(extra)) {
    for (const [k, v] of Object.entries(extra as Record<string, unknown>)) if (typeof v === 'string') add([k], v);
  } else if (Array.isArray(extra)) {
    for (const f of extra as { path?: unknown; field?: unknown; message?: unknown }[]) {
      const name =
        typeof f?.field === 'string'
          ? f.field
          : Array.isArray(f?.path)
            ? f.path[0]
            : typeof f?.path === 'string'
              ? f.path.split('.')[0]
              : '';
      if (typeof f?.message === 'string') add([name as string], f.message);
    }
  }
  const general = rest.length ? rest.join(' ') : Object.keys(byField).length ? null : errorMessage(err);
  return { byField, general };
}
