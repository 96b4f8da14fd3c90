/** Keys of demonstration media and clinic logos, from numeric ids and our own names only. */

function id(value: number, what: string): number {
  if (!Number.isSafeInteger(value) || value <= 0) throw new Error(`bad ${what} id ${value}`);
  return value;
}

/** `exercises/4/demo/`: everything of an exercise's demonstrations. */
export function exerciseDemoPrefix(exerciseId: number): string {
  return `exercises/${id(exerciseId, 'exercise')}/demo/`;
}

/** A demonstration picture (`exercises/4/demo/9.jpg`) or its thumbnail (`9-thumb.jpg`). */
export function demoPictureKey(exerciseId: number, pictureId: number, size: 'full' | 'thumb'): string {
  return `${exerciseDemoPrefix(exerciseId)}${id(pictureId, 'picture')}${size === 'thumb' ? '-thumb' : ''}.jpg`;
}

/** A clinic's logo, by version: `clinics/1/logo-v2.png`. */
export function clinicLogoKey(clinicId: number, version: number): string {
  return `clinics/${id(clinicId, 'clinic')}/logo-v${id(version, 'version')}.png`;
}
