/**
 * The picture options shared by the verbs that write a report folder (`report`, `reduce`):
 * `--width`/`--height` (pixels, 64–4096; default 1200 × 800) and `--pictures N` / `--no-pictures`
 * (how many view pictures at most; default 12, at least 1, or none).
 */
import { parseNumber, str, type ParsedArgs } from './args.ts';

/** Pictures a report makes at most unless `--pictures` says otherwise. */
export const MAX_PICTURES_DEFAULT = 12;

export interface PictureOptions {
  /** Picture size in pixels. */
  width: number;
  height: number;
  /** Most pictures to make (0: none). */
  maxPictures: number;
}

/** Reads and checks the picture options of `args`; a bad value throws a one-line error naming the option. */
export function pictureOptions(args: ParsedArgs): PictureOptions {
  const size = (name: string, def: number) => {
    const t = str(args, name);
    const v = t === undefined ? def : parseNumber(t, name);
    if (!(Number.isInteger(v) && v >= 64 && v <= 4096)) throw new Error(`--${name}: expected whole pixels from 64 to 4096, got ${t}`);
    return v;
  };
  const width = size('width', 1200), height = size('height', 800);
  const picturesText = str(args, 'pictures');
  if (picturesText !== undefined && args.options['no-pictures']) throw new Error('choose one of --pictures and --no-pictures');
  const maxPictures = args.options['no-pictures'] ? 0 : picturesText === undefined ? MAX_PICTURES_DEFAULT : parseNumber(picturesText, 'pictures');
  if (!(Number.isInteger(maxPictures) && (maxPictures >= 1 || args.options['no-pictures']))) throw new Error(`--pictures: expected a whole number of pictures, at least 1, got "${picturesText}" (--no-pictures makes none)`);
  return { width, height, maxPictures };
}
