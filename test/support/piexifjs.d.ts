/** The few calls of piexifjs the picture tests use (the package ships no types). */
declare module 'piexifjs' {
  const piexif: {
    ImageIFD: { Orientation: number; Make: number; Model: number };
    GPSIFD: { GPSLatitudeRef: number; GPSLatitude: number; GPSLongitudeRef: number; GPSLongitude: number };
    dump(exif: Record<string, Record<number, unknown>>): string;
    insert(exifBytes: string, jpegBinary: string): string;
  };
  export default piexif;
}
