/**
 * SVG → PNG with resvg (a Rust SVG renderer; @resvg/resvg-js). resvg draws text only with fonts it can load:
 * it is given the system fonts and DejaVu Sans (Debian: fonts-dejavu-core, which .ci/run installs) as the
 * default family, so labels render the same on any machine that has it.
 */
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';

// Loaded when a PNG is asked for, not by every command that imports the plots (it is a native module).
const require = createRequire(import.meta.url);
let resvg: typeof import('@resvg/resvg-js') | undefined;

/** Font files tried in order (Debian and Fedora locations); the ones present are loaded explicitly. */
const FONT_FILES = [
  '/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf',
  '/usr/share/fonts/truetype/dejavu/DejaVuSans-Bold.ttf',
  '/usr/share/fonts/dejavu-sans-fonts/DejaVuSans.ttf',
  '/usr/share/fonts/dejavu-sans-fonts/DejaVuSans-Bold.ttf',
];

/** Render an SVG document to PNG bytes at `scale` times its size (2 gives crisp figures on slides). */
export function svgToPng(svg: string, scale = 2): Buffer {
  resvg ??= require('@resvg/resvg-js') as typeof import('@resvg/resvg-js');
  const renderer = new resvg.Resvg(svg, {
    fitTo: { mode: 'zoom', value: scale },
    background: 'white',
    font: { loadSystemFonts: true, fontFiles: FONT_FILES.filter((f) => existsSync(f)), defaultFontFamily: 'DejaVu Sans' },
  });
  return renderer.render().asPng();
}
